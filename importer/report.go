package importer

// Report is what Scan and Annotate found and computed. It marshals to the
// JSON of `fluecell annotate --report`.
type Report struct {
	// Rules are the rules used, as "COLUMN = EXPR", each once.
	Rules []string `json:"rules"`
	// Totals is Scope 1: the fossil tCO2 and the tCO2e of stationary and
	// mobile combustion and fugitive releases, over every table. Scope 2
	// (purchased energy), embodied emissions (build plans), biogenic CO2 and
	// tables of the user's own rules are never in it: see ByKind.
	Totals Totals `json:"totals"`
	// ByKind keeps the totals of each kind apart (kinds.go), each with how
	// complete it is; kinds are never added together.
	ByKind []KindTotal `json:"totals_by_kind"`
	// Biogenic is the biogenic CO2 of every table, t: a memo item, in no
	// total (tCO2 and tCO2e are fossil).
	Biogenic float64 `json:"tCO2_biogenic"`
	// Incomplete: some total misses rows that were found but not computed.
	Incomplete bool `json:"incomplete"`
	// ByFuel splits Totals by canonical fuel id (or technology for build
	// plans; the cell text when it names no known fuel).
	ByFuel map[string]Totals `json:"by_fuel"`
	// Warnings are the unit-consistency findings, in sheet, row, column order.
	Warnings []Warning `json:"warnings"`
	// Layout is "inline" when every table got its computed columns beside
	// it, "side-sheet" when any table's columns went to a side sheet.
	Layout string `json:"layout"`
	// Rows is the number of data rows in the tables; Computed how many got
	// a number from every rule.
	Rows     int `json:"rows"`
	Computed int `json:"computed"`
	// Tables describes each table found.
	Tables []TableInfo `json:"tables"`
	// Sheets says what happened to every worksheet scanned, in workbook
	// order: computed, partial, nothing computed or skipped, with the reason.
	Sheets []SheetInfo `json:"sheets"`
	// Packs are the factor packs of the engine used, with their versions.
	Packs []PackVersion `json:"packs"`
	// BuildPlan is what the build-plan tables add to the atmosphere; nil
	// without a computed build-plan row.
	BuildPlan *BuildPlanTotal `json:"build_plan,omitempty"`
	// GWPSet is the IPCC assessment whose GWP-100 values weight CH4 and N2O in
	// every call that names no set: Options.GWPSet, the mapping's gwp_set, or
	// funcs.DefaultGWPSet. Rules whose calls took it say so: "(GWP set ar6)".
	GWPSet string `json:"gwp_set"`
	// Mapping is the mapping file the tables were read with (Options.Mapping).
	Mapping *MappingRef `json:"mapping,omitempty"`
	// Uncertainty says how the 95 % intervals of the totals were computed:
	// the approach, its seed and draws, and the activity-data uncertainty
	// of each table (uncertainty.go).
	Uncertainty *UncertaintyInfo `json:"uncertainty,omitempty"`
	// PageFileError, when set, says why the rows past Options.PageBudget
	// could not go to a temporary file (TMPDIR cannot be written, or its
	// disk is full): they stayed in memory, with the same results, and the
	// memory the scan took was not bounded.
	PageFileError string `json:"page_file_error,omitempty"`
	// Output is the path written by Annotate ("" for Scan).
	Output string `json:"output,omitempty"`
}

// Totals are tonnes of CO2 and of CO2e.
type Totals struct {
	TCO2  float64 `json:"tCO2"`
	TCO2e float64 `json:"tCO2e"`
	// NotComputable says why the sum is not a number (it exceeds the
	// float64 range); TCO2 and TCO2e are then 0 and encode as null
	// (totals.go).
	NotComputable string `json:"not_computable,omitempty"`
	// Low and High are the 95 % interval of TCO2e (uncertainty.go).
	TotalInterval
}

// BuildPlanTotal is the embodied total of the build-plan tables, with the range
// the rows' factors carry, as carbon and as atmospheric CO2. CO2e is counted
// as CO2 for GtC and ppm: a screening figure of what building the plan adds.
type BuildPlanTotal struct {
	TCO2e float64 `json:"tCO2e"`
	// Low and High: every row at its factor's published minimum or maximum;
	// absent when a row's factor has no published range.
	Low  *float64 `json:"tCO2e_low,omitempty"`
	High *float64 `json:"tCO2e_high,omitempty"`
	GtC  float64  `json:"GtC"`
	// PPM is the rise in atmospheric CO2 if all of it stayed there
	// (AirborneFraction 1); PPMObserved at the long-run observed airborne
	// fraction (ObservedAirborneFraction, Global Carbon Budget).
	PPM                      float64 `json:"ppm"`
	AirborneFraction         float64 `json:"airborne_fraction"`
	PPMObserved              float64 `json:"ppm_observed"`
	ObservedAirborneFraction float64 `json:"observed_airborne_fraction"`
	// RangeNote says why a range is missing.
	RangeNote string `json:"range_note,omitempty"`
}

// Warning is one finding at one cell.
type Warning struct {
	Sheet    string `json:"sheet"`
	Cell     string `json:"cell"`     // "C17"; the header cell for a header-level finding
	Severity string `json:"severity"` // error (row not computed), warning, info
	Code     string `json:"code"`     // see the Code constants
	Message  string `json:"message"`
}

// Severities.
const (
	SevError   = "error"   // the row could not be computed: it has no number
	SevWarning = "warning" // computed, but check it
	SevInfo    = "info"    // how a value was read (alias, basis conversion)
)

// Warning codes (DESIGN.md), plus factor-missing, tech-unknown and
// rule-error for rows a rule cannot compute for other reasons.
const (
	CodeUnitUnknown      = "unit-unknown"
	CodeUnitAmbiguous    = "unit-ambiguous"
	CodeUnitDimension    = "unit-dimension"
	CodeUnitBasis        = "unit-basis"
	CodeUnitMixed        = "unit-mixed"
	CodeValueNotNumber   = "value-not-number"
	CodeValueTextNumber  = "value-text-number"
	CodeValueNegative    = "value-negative"
	CodeValueOutlier     = "value-outlier"
	CodeFuelUnknown      = "fuel-unknown"
	CodeFuelAlias        = "fuel-alias"
	CodeFormulaNoCache   = "formula-no-cache"
	CodeExistingMismatch = "existing-mismatch"
	CodeFactorMissing    = "factor-missing" // the pack lacks a value this row needs
	CodeTechUnknown      = "tech-unknown"   // a build plan names an unknown technology
	CodeRuleError        = "rule-error"     // a rule failed on this row for another reason
	CodeNotComputed      = "not-computed"   // a row or column left out on purpose: a total, a price, electricity
	CodeGridUnknown      = "grid-unknown"   // purchased electricity and no grid to compute it with: how to choose one
	CodeReadAs           = "read-as"        // how a table was read: its grid, sector, vehicle mode, US gallons
)

// TableInfo describes one detected table.
type TableInfo struct {
	Sheet     string       `json:"sheet"`
	Range     string       `json:"range"` // header to last data row, e.g. "A4:H120"
	HeaderRow int          `json:"header_row"`
	Kind      string       `json:"kind"`           // fuel-log, wide, build-plan, custom
	Fuel      string       `json:"fuel,omitempty"` // the fuel of every row (no fuel column), from the title or the mapping
	Unit      string       `json:"unit,omitempty"` // the unit of amounts whose header states none, from the title or the mapping
	Columns   []ColumnInfo `json:"columns"`
	Rules     []string     `json:"rules"`
	Rows      int          `json:"rows"`
	Computed  int          `json:"computed"`
	Totals    Totals       `json:"totals"`           // this table's share of Report.Totals (Scope 1)
	ByKind    []KindTotal  `json:"totals_by_kind"`   // this table's totals by kind
	Biogenic  float64      `json:"tCO2_biogenic"`    // this table's biogenic CO2, t (a memo item)
	Layout    string       `json:"layout"`           // inline or side-sheet
	Status    string       `json:"status"`           // StatusOK, StatusPartial or StatusNone
	Reason    string       `json:"reason,omitempty"` // "computed 6,504 of 6,570 rows", or why none
	Output    string       `json:"output,omitempty"` // where the computed columns are, e.g. "Fuel log!I4:K120"
}

// ColumnInfo is one column of a table: its header, the identifier rules use
// and the role fluecell gave it.
type ColumnInfo struct {
	Cell       string `json:"cell"` // header cell
	Header     string `json:"header"`
	Ident      string `json:"ident"`
	HeaderUnit string `json:"header_unit,omitempty"` // unit written in the header; its variable is Ident+"_unit"
	Role       string `json:"role,omitempty"`
	Fuel       string `json:"fuel,omitempty"` // the fuel of a fuel-column
	Why        string `json:"why,omitempty"`  // the evidence for the role, or the mapping entry that set it
}

// PackVersion names a factor pack and the hash of its rows.
type PackVersion struct {
	Name    string `json:"name"`
	Title   string `json:"title"`
	Basis   string `json:"basis,omitempty"`
	Version string `json:"version"`
	Rows    int    `json:"rows"`
}

// Layouts.
const (
	LayoutInline    = "inline"
	LayoutSideSheet = "side-sheet"
)

// Count returns how many warnings have severity sev.
func (r *Report) Count(sev string) int {
	n := 0
	for _, w := range r.Warnings {
		if w.Severity == sev {
			n++
		}
	}
	return n
}

// SheetInfo says what happened to one worksheet.
type SheetInfo struct {
	Name     string `json:"name"`
	Status   string `json:"status"` // StatusOK, StatusPartial, StatusNone or StatusSkipped
	Reason   string `json:"reason,omitempty"`
	Tables   int    `json:"tables"`
	Rows     int    `json:"rows"`
	Computed int    `json:"computed"`
}

// Statuses of a sheet or table.
const (
	StatusOK      = "ok"               // every data row computed
	StatusPartial = "partial"          // some rows computed; the others have findings at their rows
	StatusNone    = "nothing computed" // a table was found but no row could be computed
	StatusSkipped = "skipped"          // no table: Reason says why
)

// statusOf names the status of rows of which computed were computed.
func statusOf(rows, computed int) string {
	switch {
	case rows > 0 && computed == rows:
		return StatusOK
	case computed > 0:
		return StatusPartial
	}
	return StatusNone
}
