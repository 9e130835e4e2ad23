package funcs

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// TestQuoteKeepsCharactersWhole: a long name quoted in a message is cut,
// but never inside a multi-byte UTF-8 character.
func TestQuoteKeepsCharactersWhole(t *testing.T) {
	for _, s := range []string{strings.Repeat("é", 60), "a" + strings.Repeat("€", 40), strings.Repeat("x", 100), "short é"} {
		q := quote(s)
		if !utf8.ValidString(q) || len(q) > 82 {
			t.Errorf("quote(%q) = %q", s, q)
		}
		if len(s) <= 80 && q != `"`+s+`"` {
			t.Errorf("quote changed a short name: %q", q)
		}
	}
}
