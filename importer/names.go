package importer

import (
	"fmt"
	"unicode/utf8"
)

// maxNameLen is the longest cell text, in bytes, looked up as a fuel or
// technology name. The longest names in the packs are under 60 characters;
// a longer text is a note or a paste, and looking it up (a spelling
// suggestion compares it letter by letter with every name) would cost time
// in proportion to its length for nothing.
const maxNameLen = 200

// longName reports a text too long to be looked up as a name.
func longName(s string) bool { return len(s) > maxNameLen }

// longNameMessage is the finding of a fuel cell whose text is too long to
// be a fuel name.
func longNameMessage(s string) string {
	return fmt.Sprintf("a text of %d characters (%s) is not a fuel name: a name is at most %d characters", utf8.RuneCountInString(s), quoteText(s), maxNameLen)
}

// longTechError is the error of a technology cell whose text is too long to
// be a technology name.
func longTechError(s string) error {
	return fmt.Errorf("a text of %d characters (%s) is not a technology name: a name is at most %d characters", utf8.RuneCountInString(s), quoteText(s), maxNameLen)
}
