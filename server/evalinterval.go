package server

import (
	"bytes"
	"encoding/json"
	"errors"
	"strconv"

	"github.com/fluecell/fluecell/funcs"
)

// intervalField is the "interval" field of POST /v1/eval: true asks for the 95 % interval
// by Approach 1, an object {"approach": "approach1"|"approach2", "seed": N, "draws": N}
// chooses the approach (seed and draws for approach2; draws 10000 when left out), false or
// absent asks for none.
type intervalField struct {
	on  bool
	opt funcs.IntervalOptions
}

// errIntervalShape says what the field accepts.
var errIntervalShape = errors.New(`interval must be true, false or {"approach": "approach1"|"approach2", "seed": N, "draws": N}`)

// UnmarshalJSON reads true, false or the object form; errors say what is accepted.
func (f *intervalField) UnmarshalJSON(b []byte) error {
	b = bytes.TrimSpace(b)
	switch string(b) {
	case "true":
		*f = intervalField{on: true, opt: funcs.IntervalOptions{Approach: funcs.Approach1}}
		return nil
	case "false", "null":
		*f = intervalField{}
		return nil
	}
	var o struct {
		Approach *string     `json:"approach"`
		Seed     json.Number `json:"seed"`
		Draws    json.Number `json:"draws"`
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&o); err != nil {
		return errIntervalShape
	}
	opt := funcs.IntervalOptions{Approach: funcs.Approach1}
	if o.Approach != nil {
		a, err := funcs.ParseApproach(*o.Approach)
		if err != nil {
			return errors.New("interval.approach " + strconv.Quote(*o.Approach) + " is not known: accepted are approach1 (error propagation) and approach2 (Monte Carlo)")
		}
		opt.Approach = a
	}
	if o.Seed != "" {
		s, err := strconv.ParseUint(string(o.Seed), 10, 64)
		if err != nil {
			return errors.New("interval.seed " + string(o.Seed) + " must be a whole number from 0 to 18446744073709551615")
		}
		opt.Seed = s
	}
	if o.Draws != "" {
		d, err := strconv.Atoi(string(o.Draws))
		if err != nil || d < 1 || d > maxDraws {
			return errors.New("interval.draws " + string(o.Draws) + " must be a whole number from 1 to " + strconv.Itoa(maxDraws))
		}
		opt.Draws = d
	}
	*f = intervalField{on: true, opt: opt}
	return nil
}

// maxDraws bounds the Monte Carlo draws of one request (about 2 ms per 10 000 draws of a
// fuel call, measured on 2 cores; rows multiply it).
const maxDraws = 100_000
