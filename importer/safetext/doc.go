// Package safetext makes untrusted text safe to show: file names and
// messages printed to a terminal or a log (control characters escaped,
// never cut inside a character), and fields of the CSV files fluecell
// writes (a text field that a spreadsheet would read as a formula is
// neutralised).
package safetext
