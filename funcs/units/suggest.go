package units

import (
	"strings"
	"unicode/utf8"
)

// maxSuggestRunes bounds the names considered for a suggestion: no spelling is longer.
const maxSuggestRunes = 64

// wanted reports whether d is among want; an empty want accepts every dimension.
func wanted(d Dimension, want []Dimension) bool {
	if len(want) == 0 {
		return true
	}
	for _, w := range want {
		if w == d {
			return true
		}
	}
	return false
}

// suggestFor returns the symbol of the unit whose spelling is closest to name by edit distance
// (ignoring case), or "" when nothing is close or when the closest spellings belong to
// different units ("st" is as close to s as to t: no guess). At equal distance a unit's
// symbol beats another unit's longer spelling ("kwhh" is kWh, not kWth).
//
// Names of one or two characters get no suggestion: "EA" (each) or "LS" (lump sum) are one
// edit from many symbols, and a case-only difference is already resolved by Parse. With want,
// only units of those dimensions are suggested.
func (c *catalog) suggestFor(name string, want []Dimension) string {
	if len(name) > 4*maxSuggestRunes || utf8.RuneCountInString(name) <= 2 {
		return ""
	}
	in := []rune(strings.ToLower(name))
	if len(in) > maxSuggestRunes {
		return ""
	}
	limit := 1
	if len(in) > 4 {
		limit = 2
	}
	// rank = 2*distance, plus 1 for a spelling that is not the unit's symbol
	best, bestID, tie := 2*limit+2, uint16(0), false
	var rows [3][]int // reused by editDistance across candidates
	for _, cand := range c.suggest {
		if abs(len(cand.fold)-len(in)) > limit || !wanted(c.units[cand.id].Dim, want) {
			continue
		}
		d := editDistance(in, cand.fold, min(limit, best/2), &rows)
		if d > limit {
			continue
		}
		rank := 2 * d
		if !cand.symbol {
			rank++
		}
		switch {
		case rank < best:
			best, bestID, tie = rank, cand.id, false
		case rank == best && cand.id != bestID:
			tie = true
		}
	}
	if tie {
		return ""
	}
	return c.units[bestID].Symbol // "" for id 0
}

// editDistance is the optimal-string-alignment distance between a and b (insertions,
// deletions, substitutions and swaps of neighbours each count 1), or max+1 as soon as it is
// known to exceed max. rows is scratch space, grown as needed.
func editDistance(a, b []rune, max int, rows *[3][]int) int {
	for i := range rows {
		if cap(rows[i]) < len(b)+1 {
			rows[i] = make([]int, len(b)+1)
		}
		rows[i] = rows[i][:len(b)+1]
	}
	pp, prev, cur := rows[0], rows[1], rows[2]
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		rowMin := cur[0]
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], pp[j-2]+1)
			}
			rowMin = min(rowMin, cur[j])
		}
		if rowMin > max {
			return max + 1
		}
		pp, prev, cur = prev, cur, pp
	}
	return min(prev[len(b)], max+1)
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}
