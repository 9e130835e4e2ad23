package server

import (
	"net/http"
	"net/url"
	"strings"
	"testing"
)

func TestRedactQuery(t *testing.T) {
	const tok = "s3cret-T0ken"
	cases := map[string]string{
		"fuel=gas&amount=1":                      "fuel=gas&amount=1",
		"token=abc&fuel=gas":                     "token=REDACTED&fuel=gas",
		"fuel=gas&%74oken=abc":                   "fuel=gas&%74oken=REDACTED",
		"fuel=gas&%2574oken=abc":                 "fuel=gas&%2574oken=REDACTED", // escaped twice
		"TOKEN=abc":                              "TOKEN=REDACTED",
		"Token=abc;fuel=gas":                     "Token=REDACTED;fuel=gas",
		"fuel=gas;token=abc":                     "fuel=gas;token=REDACTED",
		"access_token=abc&api-key=d":             "access_token=REDACTED&api-key=REDACTED",
		"X-Api-Key=abc&client_secret=e":          "X-Api-Key=REDACTED&client_secret=REDACTED",
		"fuel=token&mytoken=1":                   "fuel=token&mytoken=REDACTED",
		"a=%zz&token=abc":                        "a=%zz&token=REDACTED",
		"x=" + tok:                               "x=REDACTED", // the server's token under any name
		"x=" + url.QueryEscape(tok+"/") + "&y=1": "x=REDACTED&y=1",
		tok + "&fuel=gas":                        "REDACTED&fuel=gas",
		strings.Repeat("a", 2000) + "=":          strings.Repeat("a", maxLoggedText-len("…")) + "…",
	}
	for in, want := range cases {
		if got := redactQuery(in, tok); got != want {
			t.Errorf("redactQuery(%.40q) = %.60q, want %.60q", in, got, want)
		}
	}
	for in, want := range map[string]string{
		"/v1/fn/gwp":                 "/v1/fn/gwp",
		"/v1/fn/gwp;token=abc":       "/v1/fn/gwp;token=REDACTED",
		"/v1/fn/gwp;Token=abc;x=1":   "/v1/fn/gwp;Token=REDACTED;x=1",
		"/v1/fn/" + tok:              "/v1/fn/REDACTED",
		"/token=" + tok + "/v1/eval": "/token=REDACTED/v1/eval",
	} {
		if got := redactPath(in, tok); got != want {
			t.Errorf("redactPath(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestTokenNeverLogged sends the server's token in forms it does not accept (other
// spellings, other separators, the path, other names) and finds it nowhere in the log.
func TestTokenNeverLogged(t *testing.T) {
	const token = "Sheet-Tok3n/plus+more"
	ts := startServer(t, Config{Token: token})
	esc := url.QueryEscape(token)
	fn := "/v1/fn/co2_from_carbon"
	for _, target := range []string{
		fn + "?mass=12&token=" + esc,
		fn + "?mass=12;token=" + esc,
		fn + "?mass=12&Token=" + esc,
		fn + "?mass=12&TOKEN=" + esc,
		fn + "?mass=12&access_token=" + esc,
		fn + "?mass=12&%54oken=" + esc,
		fn + "?mass=12&api_key=" + esc,
		fn + "?mass=12&x=" + esc,
		fn + "?mass=" + url.PathEscape(token),
		fn + ";token=" + url.PathEscape(token) + "?mass=12",
		"/v1/" + url.PathEscape(token),
		"/v1/functions?token=" + esc + "&x=" + esc,
	} {
		r := do(t, http.MethodGet, ts.URL+target, nil, "")
		if r.Status == 0 {
			t.Errorf("%s: no answer", target)
		}
	}
	// a body sent to a route that answers before reading it
	do(t, http.MethodPost, ts.URL+"/v1/eval?Token="+esc, map[string]string{"Content-Type": "application/json"}, `{"expr": "1"}`)
	logs := ts.logs.String()
	for _, form := range []string{token, esc, url.PathEscape(token), "Sheet-Tok3n"} {
		if strings.Contains(logs, form) {
			t.Errorf("the log holds the token as %q:\n%s", form, logs)
		}
	}
	if n := strings.Count(logs, `"msg":"request"`); n != 13 {
		t.Errorf("%d request lines, want 13:\n%s", n, logs)
	}

	// without a configured token, token-like parameters are redacted in the path, the query
	// and the messages that quote them
	open := startServer(t, Config{})
	get(t, open.URL+"/v1/fn/co2_from_carbon;access_token=Other-Secret-1?mass=12")
	get(t, open.URL+"/v1/fn/co2_from_carbon?mass=12&Token=Other-Secret-2")
	get(t, open.URL+"/v1/functions?api_key=Other-Secret-3")
	if logs := open.logs.String(); strings.Contains(logs, "Other-Secret") {
		t.Errorf("the log holds a credential:\n%s", logs)
	}
}
