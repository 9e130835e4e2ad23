package calctest

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"net/url"
	"os"
	"path/filepath"
)

// profileSettings are the configuration items of the throwaway soffice profile:
// path, property, XML-escaped value element content.
type profileSetting struct{ path, prop, value string }

// writeProfile writes user/registrymodifications.xcu under dir so that Calc updates external
// links without asking (WEBSERVICE shows Err:540 otherwise), runs without macro prompts, trusts
// trustedDir, writes no lock files next to the workbooks, and formats with the en-US locale.
func writeProfile(dir, trustedDir string) error {
	settings := []profileSetting{
		// Link = 0: always update links from external sources.
		{"/org.openoffice.Office.Calc/Content/Update", "Link", "0"},
		{"/org.openoffice.Office.Common/Security/Scripting", "MacroSecurityLevel", "0"},
		{"/org.openoffice.Office.Common/Security/Scripting", "SecureURL", "<it>" + escape(fileURL(trustedDir)) + "</it>"},
		{"/org.openoffice.Office.Common/Misc", "UseLocking", "false"},
		{"/org.openoffice.Setup/L10N", "ooLocale", "en-US"},
		{"/org.openoffice.Setup/L10N", "ooSetupSystemLocale", "en-US"},
	}
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0" encoding="UTF-8"?>` + "\n")
	b.WriteString(`<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">` + "\n")
	for _, s := range settings {
		fmt.Fprintf(&b, `<item oor:path="%s"><prop oor:name="%s" oor:op="fuse"><value>%s</value></prop></item>`+"\n",
			s.path, s.prop, s.value)
	}
	b.WriteString("</oor:items>\n")
	user := filepath.Join(dir, "user")
	if err := os.MkdirAll(user, 0o700); err != nil {
		return fmt.Errorf("profile: %w", err)
	}
	if err := os.WriteFile(filepath.Join(user, "registrymodifications.xcu"), b.Bytes(), 0o600); err != nil {
		return fmt.Errorf("profile: %w", err)
	}
	return nil
}

// fileURL turns an absolute path into a file:/// URL as LibreOffice writes them.
func fileURL(abs string) string {
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}).String()
}

func escape(s string) string {
	var b bytes.Buffer
	_ = xml.EscapeText(&b, []byte(s))
	return b.String()
}
