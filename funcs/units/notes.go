package units

import "strings"

// A few spellings are read one way where another reading exists: a bare gallon is the US
// gallon, not the imperial one. Parse accepts them; SpellingNote returns the note a result
// computed from such a unit should carry, so that the reading is visible.

// GallonNote is the note for a gallon read as the US gallon.
const GallonNote = "gallon read as US gallon (3.785411784 L); write gal_imp for imperial"

// spellingNote is a note for spellings read by convention.
type spellingNote struct {
	spell []string // matched case-insensitively
	note  string
}

// spellingNotes lists the spellings that carry a note: every gallon spelling that does not say
// US or imperial, including the thousand-gallon ones.
func spellingNotes() []spellingNote {
	return []spellingNote{
		{spell: []string{"gal", "gals", "gallon", "gallons", "GA", "kgal", "kgals", "thousand gallons"}, note: GallonNote},
		// every spelling here must be ASCII: SpellingNote folds ASCII letters only
	}
}

// SpellingNote returns the note a result should carry when its amount was given in the unit
// string s: GallonNote for a gallon spelling that does not say US or imperial ("gal",
// "Gallons", "kgal", "million gallons"), "" for any other spelling ("US gallons", "gal_imp",
// "GJ") and for a string that is no unit. It accepts what Parse accepts.
func SpellingNote(s string) string {
	u, err := Lookup(s)
	if err != nil || u.Dim != Volume {
		return ""
	}
	n := normalize(s)
	var buf [64]byte
	short := len(n) <= len(buf)
	if short {
		k := buf[:len(n)]
		for i := 0; i < len(n); i++ {
			c := n[i]
			if 'A' <= c && c <= 'Z' {
				c += 'a' - 'A'
			}
			k[i] = c
		}
		// the spellings with a note are ASCII: folding ASCII letters is enough
		if note, ok := table.notes[string(k)]; ok {
			return note
		}
	}
	if !short {
		if note, ok := table.notes[strings.ToLower(n)]; ok {
			return note
		}
	}
	if _, rest, ok := table.splitMagnitude(n); ok {
		return table.notes[strings.ToLower(rest)]
	}
	return ""
}

// asciiLower lower-cases an ASCII letter and maps every other rune to itself.
func asciiLower(r rune) rune {
	if 'A' <= r && r <= 'Z' {
		return r + 'a' - 'A'
	}
	return r
}
