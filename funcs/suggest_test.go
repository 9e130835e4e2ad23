package funcs

import (
	"math/rand/v2"
	"strings"
	"testing"
	"time"
)

// fullDistance is the textbook Levenshtein table, the reference for the banded one.
func fullDistance(a, b []rune) int {
	d := make([][]int, len(a)+1)
	for i := range d {
		d[i] = make([]int, len(b)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
		}
	}
	return d[len(a)][len(b)]
}

// TestEditDistanceAtMost compares the banded distance with the full table on random words
// over a small alphabet (many near misses), for every limit from 0 to 6.
func TestEditDistanceAtMost(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	word := func() []rune {
		w := make([]rune, rng.IntN(10))
		for i := range w {
			w[i] = []rune("abcé")[rng.IntN(4)]
		}
		return w
	}
	for n := 0; n < 20000; n++ {
		a, b := word(), word()
		full := fullDistance(a, b)
		for limit := 0; limit <= 6; limit++ {
			want := min(full, limit+1)
			if got := editDistanceAtMost(a, b, limit); got != want {
				t.Fatalf("editDistanceAtMost(%q, %q, %d) = %d, want %d", string(a), string(b), limit, got, want)
			}
		}
		if got := editDistance(string(a), string(b)); got != full {
			t.Fatalf("editDistance(%q, %q) = %d, want %d", string(a), string(b), got, full)
		}
	}
}

func TestSuggestFrom(t *testing.T) {
	opts := []string{"energy", "manufacturing", "commercial", "residential", "agriculture"}
	for _, tc := range []struct{ in, want string }{
		{"enrgy", "energy"},
		{"Comercial", "commercial"},
		{"residental", "residential"},
		{"transport", ""},
		{"x", ""},
		{strings.Repeat("energy", 20), ""}, // over maxSuggestRunes
	} {
		if got := suggestFrom(tc.in, opts); got != tc.want {
			t.Errorf("suggestFrom(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestSuggestFromBounded: a suggestion costs microseconds however long the input and the
// options are (a request may carry a 300,000-character name, or 15,000 long variable names).
func TestSuggestFromBounded(t *testing.T) {
	long := strings.Repeat("x", 300_000)
	many := make([]string, 15_000)
	for i := range many {
		many[i] = strings.Repeat("v", 60) + string(rune('a'+i%26)) + string(rune('a'+i/26%26)) + string(rune('a'+i/676%26))
	}
	for _, tc := range []struct {
		name    string
		in      string
		options []string
		budget  time.Duration
	}{
		{"long name, long options", long, []string{long[1:], long[2:], "energy"}, 20 * time.Millisecond},
		{"long name near the bound", strings.Repeat("y", 4*maxSuggestRunes), []string{strings.Repeat("y", 4*maxSuggestRunes-1)}, 20 * time.Millisecond},
		{"64 runes, 15,000 options", strings.Repeat("v", 60) + "zzzz", many, 500 * time.Millisecond},
	} {
		start := time.Now()
		const calls = 10
		for range calls {
			suggestFrom(tc.in, tc.options)
		}
		if d := time.Since(start) / calls; d > tc.budget {
			t.Errorf("%s: one suggestion took %v, want under %v", tc.name, d, tc.budget)
		}
	}
}
