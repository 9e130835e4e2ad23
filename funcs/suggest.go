package funcs

import (
	"strings"
	"unicode/utf8"
)

// maxSuggestRunes bounds the names that get a spelling suggestion: no id, option or variable a
// suggestion points to is that long, so a longer name is no typo of one. It keeps the work of
// one suggestion to a few microseconds whatever the length of the input.
const maxSuggestRunes = 64

// editDistance is the Levenshtein distance between a and b, counted in runes. Its cost is
// len(a) x len(b): callers bound both (fuelIndex.suggest takes names of 64 bytes at most).
func editDistance(a, b string) int {
	return editDistanceAtMost([]rune(a), []rune(b), max(len(a), len(b)))
}

// editDistanceAtMost is the Levenshtein distance between a and b when it is at most limit,
// else limit+1. Only the band of cells within limit of the diagonal is computed, and the
// work stops as soon as a whole row is over limit: the cost is at most
// len(a) x (2 limit + 1) cell updates.
func editDistanceAtMost(a, b []rune, limit int) int {
	if limit < 0 {
		return 0
	}
	if d := len(a) - len(b); d > limit || -d > limit {
		return limit + 1
	}
	over := limit + 1
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = min(j, over)
	}
	for i := 1; i <= len(a); i++ {
		lo, hi := max(1, i-limit), min(len(b), i+limit)
		if lo == 1 {
			cur[0] = min(i, over)
		} else {
			cur[lo-1] = over // outside the band
		}
		rowMin := cur[lo-1]
		for j := lo; j <= hi; j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			v := prev[j-1] + cost
			if j < i+limit { // prev[j] is inside the previous row's band
				v = min(v, prev[j]+1)
			}
			v = min(v, cur[j-1]+1, over)
			cur[j] = v
			rowMin = min(rowMin, v)
		}
		if hi < len(b) {
			cur[hi+1] = over
		}
		if rowMin >= over {
			return over
		}
		prev, cur = cur, prev
	}
	return min(prev[len(b)], over)
}

// suggestFrom returns the element of options closest to s by edit distance (ignoring case),
// or "" if none is within a third of the length of s (at least 1, at most 4 edits). Names
// over maxSuggestRunes get no suggestion, and options whose length alone puts them out of
// reach are skipped before any distance is computed: the cost is linear in the total length
// of options, plus at most 9 x maxSuggestRunes cell updates per option within reach.
func suggestFrom(s string, options []string) string {
	if len(s) > 4*maxSuggestRunes {
		return ""
	}
	ls := []rune(strings.ToLower(s))
	if len(ls) > maxSuggestRunes {
		return ""
	}
	limit := max(1, min(4, len(s)/3))
	best, bestD := "", limit+1
	for _, o := range options {
		n := utf8.RuneCountInString(o) // lower-casing keeps the number of runes
		if d := n - len(ls); d >= bestD || -d >= bestD {
			continue
		}
		if d := editDistanceAtMost(ls, []rune(strings.ToLower(o)), bestD-1); d < bestD {
			best, bestD = o, d
		}
	}
	return best
}
