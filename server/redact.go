package server

import (
	"net/url"
	"strings"
)

// redacted replaces a credential in the log.
const redacted = "REDACTED"

// credentialWords are the parts of a parameter name that mark it as carrying a credential,
// matched in the name lower-cased, %-unescaped and stripped of everything but letters
// (access_token, Token, X-API-Key, client_secret, passwd...). No parameter of the API holds
// one of them.
var credentialWords = [...]string{"token", "apikey", "secret", "passw", "pwd", "auth", "bearer", "session", "signature", "credential", "jwt"}

// tokenLike reports whether a parameter name looks like it carries a credential.
func tokenLike(name string) bool {
	var b strings.Builder
	for _, r := range strings.ToLower(unescapeAll(name)) {
		if r >= 'a' && r <= 'z' {
			b.WriteRune(r)
		}
	}
	n := b.String()
	for _, w := range credentialWords {
		if strings.Contains(n, w) {
			return true
		}
	}
	return n == "key" || strings.HasSuffix(n, "key")
}

// unescapings returns s and what %-unescaping it gives, up to three times (%2574 is %74 is
// t); text that is not valid escaping ends the list, and + is read as a space.
func unescapings(s string) []string {
	out := []string{s}
	for range 3 {
		if !strings.ContainsAny(s, "%+") {
			break
		}
		u, err := url.QueryUnescape(s)
		if err != nil || u == s {
			break
		}
		out = append(out, u)
		s = u
	}
	return out
}

// unescapeAll is the last of unescapings.
func unescapeAll(s string) string {
	u := unescapings(s)
	return u[len(u)-1]
}

// holdsSecret reports whether s, or s unescaped once or more, contains the configured token.
func holdsSecret(s, token string) bool {
	if token == "" {
		return false
	}
	for _, u := range unescapings(s) {
		if strings.Contains(u, token) {
			return true
		}
	}
	return false
}

// redactParams redacts the values of "name=value" parameters separated by any of seps: a
// token-like name, or a value holding the token, gets REDACTED; a part without "=" that holds
// the token is replaced whole.
func redactParams(s, seps, token string) string {
	if s == "" {
		return s
	}
	var b strings.Builder
	b.Grow(len(s))
	for s != "" {
		i := strings.IndexAny(s, seps)
		part := s
		if i >= 0 {
			part = s[:i]
		}
		k, v, hasValue := strings.Cut(part, "=")
		switch {
		case hasValue && (tokenLike(k) || holdsSecret(v, token)):
			if holdsSecret(k, token) {
				k = redacted
			}
			b.WriteString(k + "=" + redacted)
		case holdsSecret(part, token):
			b.WriteString(redacted)
		default:
			b.WriteString(part)
		}
		if i < 0 {
			break
		}
		b.WriteByte(s[i])
		s = s[i+1:]
	}
	return b.String()
}

// redactQuery returns a raw query for the log: the value of every token-like parameter (token,
// Token, access_token, api_key..., separated by & or ;) and anything holding the configured
// token replaced by REDACTED, cut to maxLoggedText bytes.
func redactQuery(raw, token string) string {
	return cutText(redactForms(redactParams(raw, "&;", token), token), maxLoggedText)
}

// redactPath returns an escaped URL path (URL.EscapedPath) for the log with the same rules
// as redactQuery applied to each segment and its ;parameters (/v1/fn/gwp;token=…).
func redactPath(path, token string) string {
	if !strings.ContainsAny(path, ";=%") && !holdsSecret(path, token) {
		return path
	}
	return redactForms(redactParams(path, "/;", token), token)
}

// redactForms replaces the configured token in s as it is and in its escaped forms.
func redactForms(s, token string) string {
	if token == "" {
		return s
	}
	for _, form := range [...]string{token, url.QueryEscape(token), url.PathEscape(token)} {
		s = strings.ReplaceAll(s, form, redacted)
	}
	return s
}

// paramSecrets returns the values of token-like parameters in s (parameters separated by any
// of seps), as written and unescaped: a message that quotes the URL must not show them.
func paramSecrets(s, seps string) []string {
	var out []string
	for _, part := range strings.FieldsFunc(s, func(r rune) bool { return strings.ContainsRune(seps, r) }) {
		if k, v, ok := strings.Cut(part, "="); ok && v != "" && tokenLike(k) {
			out = append(out, unescapings(v)...)
		}
	}
	return out
}

// redactText replaces, in a message for the log, the configured token and the values of the
// token-like parameters of the request's path and query.
func redactText(s, token, path, rawQuery string) string {
	secrets := append(paramSecrets(path, "/;"), paramSecrets(rawQuery, "&;")...)
	if token != "" {
		secrets = append(secrets, token)
	}
	for _, v := range secrets {
		if v != "" && strings.Contains(s, v) {
			s = strings.ReplaceAll(s, v, redacted)
		}
	}
	return s
}
