package funcs

import (
	"encoding/json"
)

// Result is the value of a call or an expression with its provenance.
type Result struct {
	Value   float64   // the number
	Unit    string    // its unit, "" when it does not follow from the expression
	Sources []*Factor // the factor rows used, in first-use order
	Notes   []string  // assumptions made: alias mappings, basis conversions, defaults
}

// Clone returns a Result whose slices are its own.
func (r Result) Clone() Result {
	r.Sources = append([]*Factor(nil), r.Sources...)
	r.Notes = append([]string(nil), r.Notes...)
	return r
}

// FactorKeys lists the keys ("pack/id/quantity") of the sources.
func (r Result) FactorKeys() []string {
	out := make([]string, len(r.Sources))
	for i, f := range r.Sources {
		out[i] = f.Key()
	}
	return out
}

// MarshalJSON writes {"value", "unit", "sources", "notes"}; sources and
// notes are always arrays.
func (r Result) MarshalJSON() ([]byte, error) {
	type out struct {
		Value   float64   `json:"value"`
		Unit    string    `json:"unit"`
		Sources []*Factor `json:"sources"`
		Notes   []string  `json:"notes"`
	}
	o := out{Value: r.Value, Unit: r.Unit, Sources: r.Sources, Notes: r.Notes}
	if o.Sources == nil {
		o.Sources = []*Factor{}
	}
	if o.Notes == nil {
		o.Notes = []string{}
	}
	return json.Marshal(o)
}

// MarshalJSON writes a factor row with its key.
func (f *Factor) MarshalJSON() ([]byte, error) {
	type row struct {
		Key        string   `json:"factor"`
		Pack       string   `json:"pack"`
		ID         string   `json:"id"`
		Quantity   string   `json:"quantity"`
		Value      float64  `json:"value"`
		Unit       string   `json:"unit"`
		Low        *float64 `json:"low,omitempty"`
		High       *float64 `json:"high,omitempty"`
		Basis      string   `json:"basis,omitempty"`
		Source     string   `json:"source"`
		FromMemory bool     `json:"from_memory"`
	}
	return json.Marshal(row{Key: f.Key(), Pack: f.Pack, ID: f.ID, Quantity: f.Quantity, Value: f.Value, Unit: f.Unit,
		Low: f.Low, High: f.High, Basis: f.BasisName, Source: f.Source, FromMemory: f.FromMemory})
}
