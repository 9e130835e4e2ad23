package server

import (
	"path/filepath"
	"strings"
	"unicode"
	"unicode/utf8"
)

// maxFileName bounds the name of an answered file, in bytes.
const maxFileName = 200

// safeFileName makes a client's file name safe to hand back as an attachment's name: control
// and formatting characters (newlines, escape sequences, right-to-left overrides) and invalid
// UTF-8 become "_", and a name over maxFileName bytes is cut between characters before its
// extension.
func safeFileName(name string) string {
	name = strings.Map(func(r rune) rune {
		if r == utf8.RuneError || unicode.IsControl(r) || unicode.Is(unicode.Cf, r) {
			return '_'
		}
		return r
	}, strings.ToValidUTF8(name, "_"))
	if len(name) <= maxFileName {
		return name
	}
	ext := filepath.Ext(name)
	if len(ext) > 16 {
		ext = ""
	}
	return cutBytes(strings.TrimSuffix(name, ext), maxFileName-len(ext)) + ext
}

// cutBytes cuts s to at most n bytes between characters.
func cutBytes(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n]
}
