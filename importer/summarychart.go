package importer

import (
	"strconv"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"
)

// The summary's charts show one thing each: tCO2e by period of one kind,
// tCO2e by group of one kind, or fossil tCO2e beside the biogenic CO2 memo
// by fuel of one kind. Never tCO2 beside tCO2e (nearly the same bars), and
// never two kinds in one series.

// Bounds of the charts: charts per summary, and bars of a chart by group
// or fuel (the largest; the table lists every line).
const (
	maxCharts   = 6
	maxChartBar = 20
)

// chartSpec is one chart: categories in column catCol and one or two value
// columns, rows first to last of the summary sheet.
type chartSpec struct {
	title       string
	catCol      int
	valCols     []int // each a series; its header (row first-1) names it
	first, last int
	horizontal  bool    // bars across: long category names stay readable
	maxLabel    int     // longest category label, characters
	maxValue    float64 // largest value shown, t: the scale of the value axis
}

// valueAxis is the number format and title of the value axis: tonnes, or
// thousands or millions of tonnes for large values, so that the axis
// labels stay short.
func (c *chartSpec) valueAxis() (numFmt, title string) {
	switch {
	case c.maxValue >= 1e7:
		return `#,##0,,`, "million t"
	case c.maxValue >= 1e4:
		return `#,##0,`, "thousand t"
	}
	return "General", "t"
}

// size is the width and height of the chart, pixels: each category gets
// room for its bars and its label.
func (c *chartSpec) size() (w, h uint) {
	n := c.last - c.first + 1
	if c.horizontal {
		per := 16 + 12*len(c.valCols)
		return 640, uint(max(260, 150+per*n))
	}
	return uint(max(480, min(960, 120+40*n))), 320
}

// add draws the chart with its top-left corner at cell.
func (c *chartSpec) add(f *excelize.File, sheet, cell string) error {
	q := quoteSheet(sheet)
	col := func(n int) string { return "$" + colName(n) + "$" }
	cats := q + "!" + col(c.catCol) + strconv.Itoa(c.first) + ":" + col(c.catCol) + strconv.Itoa(c.last)
	var series []excelize.ChartSeries
	for _, v := range c.valCols {
		series = append(series, excelize.ChartSeries{
			Name:       q + "!" + col(v) + strconv.Itoa(c.first-1),
			Categories: cats,
			Values:     q + "!" + col(v) + strconv.Itoa(c.first) + ":" + col(v) + strconv.Itoa(c.last),
		})
	}
	w, h := c.size()
	typ := excelize.Col
	x := excelize.ChartAxis{Font: axisFont()}
	if c.horizontal {
		typ = excelize.Bar
		x.ReverseOrder = true // the first line of the table at the top
	} else if n := c.last - c.first + 1; float64(c.maxLabel)*labelCharPx > 0.85*float64(int(w)-90)/float64(n) {
		x.Alignment.TextRotation = -45 // slanted: labels that would not fit side by side do not overlap
	}
	legend := excelize.ChartLegend{Position: "bottom"}
	if len(series) == 1 {
		legend.Position = "none" // the title says what the bars are
	}
	gap := uint(60)
	numFmt, unit := c.valueAxis()
	return f.AddChart(sheet, cell, &excelize.Chart{
		Type:      typ,
		Series:    series,
		Title:     excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: c.title, Font: &excelize.Font{Size: 11, Bold: true, Color: axisColor}}}},
		Legend:    legend,
		Dimension: excelize.ChartDimension{Width: w, Height: h},
		XAxis:     x,
		YAxis: excelize.ChartAxis{MajorGridLines: true, Font: axisFont(), NumFmt: excelize.ChartNumFmt{CustomNumFmt: numFmt},
			Title: excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: unit, Font: &excelize.Font{Size: 9, Color: axisColor}}}}},
		GapWidth: &gap,
		// One colour per series: bars of one series are one thing.
		VaryColors: boolPtr(false),
	})
}

// Axis text: dark grey on white, 9 points; a category label's character is
// taken as labelCharPx pixels wide.
const (
	axisColor   = "333333"
	labelCharPx = 6.5
)

func axisFont() excelize.Font { return excelize.Font{Size: 9, Color: axisColor} }

// chartRows is the number of summary rows (20 px each) a chart covers,
// with a blank row after it.
func (c *chartSpec) rows() int {
	_, h := c.size()
	return int(h)/20 + 4
}

// labelLen is the length of a category label, characters.
func labelLen(s string) int { return utf8.RuneCountInString(s) }
