// Package calctest lets tests check workbooks with real third-party readers: a headless
// LibreOffice Calc driven over UNO, and Debian's openpyxl.
//
// It is test support: only _test.go files import it. Both readers run through an embedded
// Python script (calc.py) under /usr/bin/python3, which is where Debian's python3-uno and
// python3-openpyxl live (not a pyenv python3 found on PATH). When soffice, python3-uno or
// python3-openpyxl is missing the calling test is skipped with a message naming the apt
// packages to install; with FLUECELL_REQUIRE_CALC=1 in the environment it fails instead, so CI
// cannot pass by skipping.
//
// Each Calc is its own soffice process with a throwaway profile (external links allowed, one
// trusted folder, en-US locale) listening on a free local port, so several test binaries can
// run Calc at the same time. Every call is bounded by a timeout; a hung soffice fails the call
// with an error instead of hanging the test run.
package calctest
