package funcs

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// TestQuote: names in messages are cut between characters and never carry a raw control
// character.
func TestQuote(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"natral gas", `"natral gas"`},
		{"a\nb\r\x00", `"a\nb\r\x00"`},
		{"\xff", `"\xff"`},
		{"x" + strings.Repeat("é", 50), `"x` + strings.Repeat("é", 38) + `..."`}, // byte 77 is inside an é
	} {
		got := quote(tc.in)
		if got != tc.want {
			t.Errorf("quote(%q) = %s, want %s", tc.in, got, tc.want)
		}
		if !utf8.ValidString(got) || strings.ContainsAny(got, "\n\r\x00") {
			t.Errorf("quote(%q) = %q", tc.in, got)
		}
	}
	e := newTestEngine(t)
	_, err := e.Compile(`fuel_co2("` + strings.Repeat("é", 60) + `", 1, "GJ")`)
	if err == nil || !utf8.ValidString(err.Error()) || strings.ContainsRune(err.Error(), utf8.RuneError) {
		t.Errorf("a long multi-byte fuel name: %v", err)
	}
}
