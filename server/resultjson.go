package server

import (
	"bytes"
	"math"
	"strconv"
	"sync"

	"github.com/fluecell/fluecell/funcs"
)

// factorJSON keeps the JSON of each factor row, which never changes once the engine has
// loaded it, so that answers with sources are written without reflection. The number of
// entries is bounded by the rows the engine loaded.
type factorJSON struct {
	rows sync.Map // *funcs.Factor -> []byte
}

func (fj *factorJSON) get(f *funcs.Factor) ([]byte, error) {
	if b, ok := fj.rows.Load(f); ok {
		return b.([]byte), nil
	}
	b, err := f.MarshalJSON()
	if err != nil {
		return nil, err
	}
	fj.rows.Store(f, b)
	return b, nil
}

// appendSources writes a JSON array of factor rows.
func (fj *factorJSON) appendSources(b *bytes.Buffer, fs []*funcs.Factor) error {
	b.WriteByte('[')
	for i, f := range fs {
		if i > 0 {
			b.WriteByte(',')
		}
		row, err := fj.get(f)
		if err != nil {
			return err
		}
		b.Write(row)
	}
	b.WriteByte(']')
	return nil
}

// resultJSON writes {"value", "unit", "sources", "notes"}, the JSON of funcs.Result, with
// "low", "high" and "interval" after the value when the result has an interval.
func (fj *factorJSON) resultJSON(r funcs.Result) ([]byte, error) {
	var b bytes.Buffer
	b.Grow(64 + 300*len(r.Sources))
	b.WriteString(`{"value":`)
	b.Write(appendJSONFloat(nil, r.Value))
	writeInterval(&b, r.Interval, true)
	b.WriteString(`,"unit":`)
	writeJSONString(&b, r.Unit)
	b.WriteString(`,"sources":`)
	if err := fj.appendSources(&b, r.Sources); err != nil {
		return nil, err
	}
	b.WriteString(`,"notes":[`)
	for i, n := range r.Notes {
		if i > 0 {
			b.WriteByte(',')
		}
		writeJSONString(&b, n)
	}
	b.WriteString("]}")
	return b.Bytes(), nil
}

// appendJSONFloat writes a finite float64 as encoding/json does.
func appendJSONFloat(b []byte, f float64) []byte {
	abs := math.Abs(f)
	fmt := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		fmt = 'e'
	}
	b = strconv.AppendFloat(b, f, fmt, -1, 64)
	if fmt == 'e' {
		// e-09 becomes e-9, as encoding/json writes it
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

// writeInterval writes ,"low":…,"high":… of iv, and with how also
// ,"interval":{"approach", …} as funcs.Result.MarshalJSON writes it; nothing when iv is nil.
func writeInterval(b *bytes.Buffer, iv *funcs.Interval, how bool) {
	if iv == nil {
		return
	}
	b.WriteString(`,"low":`)
	b.Write(appendJSONFloat(b.AvailableBuffer(), iv.Low))
	b.WriteString(`,"high":`)
	b.Write(appendJSONFloat(b.AvailableBuffer(), iv.High))
	if !how {
		return
	}
	b.WriteString(`,"interval":{"approach":`)
	writeJSONString(b, iv.Approach.String())
	if iv.Approach == funcs.Approach2 {
		b.WriteString(`,"mean":`)
		b.Write(appendJSONFloat(b.AvailableBuffer(), iv.Mean))
		b.WriteString(`,"draws":`)
		b.WriteString(strconv.Itoa(iv.Draws))
		b.WriteString(`,"seed":`)
		b.WriteString(strconv.FormatUint(iv.Seed, 10))
	}
	b.WriteByte('}')
}
