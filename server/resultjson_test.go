package server

import (
	"encoding/json"
	"math"
	"reflect"
	"testing"

	"github.com/fluecell/fluecell/funcs"
)

func TestAppendJSONFloat(t *testing.T) {
	for _, v := range []float64{0, 1, -1, 56.1, 0.1, 1e-6, 9.99e-7, 1e-7, 1.5e-9, 1e20, 1e21, 1.2345e300, -3e-300,
		math.SmallestNonzeroFloat64, math.MaxFloat64, 2.6612935425, 1.05505585262, 1 / 3.0} {
		want, _ := json.Marshal(v)
		if got := string(appendJSONFloat(nil, v)); got != string(want) {
			t.Errorf("appendJSONFloat(%v) = %s, encoding/json writes %s", v, got, want)
		}
	}
}

// TestResultJSON: the hand-written JSON of a result means what funcs.Result.MarshalJSON says.
func TestResultJSON(t *testing.T) {
	e := newEngine(t)
	var fj factorJSON
	check := checkResultJSON(t, &fj)
	intervals := 0
	for _, f := range e.Functions() {
		p, err := e.Compile(f.Example)
		if err != nil {
			t.Fatal(err)
		}
		res, err := p.Eval(nil)
		if err != nil {
			t.Fatal(err)
		}
		check(f.Name, res)
		// with an interval by either approach (fuel functions have one)
		for _, opt := range []funcs.IntervalOptions{{Approach: funcs.Approach1}, {Approach: funcs.Approach2, Seed: 3, Draws: 100}} {
			res, err := p.EvalInterval(nil, opt)
			if err != nil {
				t.Fatal(err)
			}
			check(f.Name+" "+opt.Approach.String(), res)
			if res.Interval != nil {
				intervals++
			}
		}
	}
	if intervals == 0 {
		t.Error("no example gave an interval: the JSON of low, high and interval went unchecked")
	}
}

func checkResultJSON(t *testing.T, fj *factorJSON) func(name string, res funcs.Result) {
	return func(name string, res funcs.Result) {
		t.Helper()
		want, err := json.Marshal(res)
		if err != nil {
			t.Fatal(err)
		}
		got, err := fj.resultJSON(res)
		if err != nil {
			t.Fatal(err)
		}
		var a, b any
		if err := json.Unmarshal(got, &a); err != nil {
			t.Fatalf("%s: %v: %s", name, err, got)
		}
		_ = json.Unmarshal(want, &b)
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%s:\n got %s\nwant %s", name, got, want)
		}
	}
}
