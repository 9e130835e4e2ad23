package importer

import (
	"encoding/json"
	"math"
	"strconv"

	"github.com/fluecell/fluecell/funcs"
)

// activity reads a table's activity_uncertainty: the 95 % half-width of its amounts in per
// cent, from 0 to below funcs.MaxActivityPercent; nil when the key is absent. The error names
// the table's JSON path and the accepted range.
func (p *mapParser) activity(obj map[string]any, at string) (*float64, error) {
	v, ok := obj["activity_uncertainty"]
	if !ok {
		return nil, nil
	}
	at = joinPath(at, "activity_uncertainty")
	n, isNum := v.(json.Number)
	x, err := strconv.ParseFloat(string(n), 64)
	if !isNum || err != nil || math.IsNaN(x) || x < 0 || x >= funcs.MaxActivityPercent {
		found := jsonKind(v)
		if isNum {
			found = string(n)
		}
		return nil, p.fail(at, "%s is not an activity-data uncertainty: give the half-width of the 95 %% interval of the table's amounts in per cent, from 0 to below %d (5 for ±5 %%)",
			found, funcs.MaxActivityPercent)
	}
	return &x, nil
}
