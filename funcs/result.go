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
	// Interval is the 95 % interval of Value, when asked for (CallInterval,
	// EvalInterval, RunInterval) and computable; nil otherwise.
	Interval *Interval
}

// Clone returns a Result whose slices are its own.
func (r Result) Clone() Result {
	r.Sources = append([]*Factor(nil), r.Sources...)
	r.Notes = append([]string(nil), r.Notes...)
	if r.Interval != nil {
		iv := *r.Interval
		r.Interval = &iv
	}
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
// notes are always arrays. With an interval it adds "low", "high" and
// "interval" ({"approach"}, and "mean", "draws", "seed" for approach2).
func (r Result) MarshalJSON() ([]byte, error) {
	type out struct {
		Value    float64       `json:"value"`
		Low      *float64      `json:"low,omitempty"`
		High     *float64      `json:"high,omitempty"`
		Interval *intervalJSON `json:"interval,omitempty"`
		Unit     string        `json:"unit"`
		Sources  []*Factor     `json:"sources"`
		Notes    []string      `json:"notes"`
	}
	o := out{Value: r.Value, Unit: r.Unit, Sources: r.Sources, Notes: r.Notes}
	if iv := r.Interval; iv != nil {
		o.Low, o.High, o.Interval = &iv.Low, &iv.High, iv.json()
	}
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

// intervalJSON describes how an interval was computed.
type intervalJSON struct {
	Approach string   `json:"approach"`
	Mean     *float64 `json:"mean,omitempty"`
	Draws    int      `json:"draws,omitempty"`
	Seed     *uint64  `json:"seed,omitempty"`
}

func (iv *Interval) json() *intervalJSON {
	o := &intervalJSON{Approach: iv.Approach.String()}
	if iv.Approach == Approach2 {
		o.Mean, o.Draws, o.Seed = &iv.Mean, iv.Draws, &iv.Seed
	}
	return o
}
