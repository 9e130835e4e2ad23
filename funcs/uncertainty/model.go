package uncertainty

import (
	"fmt"
	"math"
)

// Factor is one uncertain quantity: its value and the published 95 % range
// [Low, High]. A factor with HasRange false is exact.
type Factor struct {
	Name      string  // for error messages, e.g. "ipcc2006/natural_gas/co2_ef"
	Value     float64 // the central value, > 0 when HasRange
	Low, High float64 // 95 % interval, Low <= Value <= High
	HasRange  bool
}

// Use is a factor of a term: the index into Model.Factors and the power (+1
// multiplies, -1 divides).
type Use struct {
	Factor int
	Power  int
}

// Term is Value = a coefficient times the product of its factors, given by
// its value at the central factor values.
type Term struct {
	Value float64
	Uses  []Use
}

// Model is a result built as a sum of terms.
type Model struct {
	Factors []Factor
	Terms   []Term
}

// Total is the model's value at the central factor values.
func (m Model) Total() float64 {
	s := 0.0
	for _, t := range m.Terms {
		s += t.Value
	}
	return s
}

// Interval is a 95 % interval of a result.
type Interval struct {
	Low, High float64
	Mean      float64 // the mean of the draws (Approach 2); the value for Approach 1
}

// halves returns the lower and upper half-widths of f as fractions of its value.
func (f Factor) halves() (lo, hi float64) {
	if !f.HasRange {
		return 0, 0
	}
	return (f.Value - f.Low) / f.Value, (f.High - f.Value) / f.Value
}

// check validates the model; errors name the factor or term and what is accepted.
func (m Model) check() error {
	for i, f := range m.Factors {
		if !f.HasRange {
			continue
		}
		name := f.Name
		if name == "" {
			name = fmt.Sprintf("factor %d", i)
		}
		switch {
		case !(f.Value > 0) || math.IsInf(f.Value, 0):
			return fmt.Errorf("%s: a range needs a positive finite value, got %g", name, f.Value)
		case !(f.Low > 0) || !(f.Low <= f.Value) || !(f.High >= f.Value) || math.IsInf(f.High, 0):
			return fmt.Errorf("%s: range %g..%g must be positive and hold the value %g", name, f.Low, f.High, f.Value)
		}
	}
	for i, t := range m.Terms {
		if math.IsNaN(t.Value) || math.IsInf(t.Value, 0) {
			return fmt.Errorf("term %d: value must be finite, got %g", i, t.Value)
		}
		for _, u := range t.Uses {
			if u.Factor < 0 || u.Factor >= len(m.Factors) {
				return fmt.Errorf("term %d: factor index %d out of range 0..%d", i, u.Factor, len(m.Factors)-1)
			}
			if u.Power != 1 && u.Power != -1 {
				return fmt.Errorf("term %d: power %d of %s must be 1 or -1", i, u.Power, m.Factors[u.Factor].Name)
			}
		}
	}
	return nil
}
