package server

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/emulation"
	cdppage "github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// requireBrowserEnv names the variable that turns a missing chromium into a test failure.
const requireBrowserEnv = "FLUECELL_REQUIRE_BROWSER"

// shotsEnv names a folder that also receives a copy of every screenshot, for a person to look
// at ("" or unset: none).
const shotsEnv = "FLUECELL_SCREENSHOTS"

// browserTimeout bounds one browser test.
const browserTimeout = 3 * time.Minute

// tab is a headless chromium tab driven over the DevTools protocol.
type tab struct {
	t         *testing.T
	ctx       context.Context
	downloads string       // the folder downloads are saved in
	dialogs   atomic.Int32 // JavaScript dialogs (alert, confirm, prompt) that opened
}

// startBrowser starts Debian's chromium headless with a fresh profile and opens a tab whose
// viewport is width x height CSS pixels. It skips t when chromium is not installed, or fails
// it when FLUECELL_REQUIRE_BROWSER=1.
func startBrowser(t *testing.T, width, height int) *tab {
	t.Helper()
	exe := ""
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			exe = p
			break
		}
	}
	if exe == "" {
		msg := "chromium not found on PATH; install with: apt-get install -y chromium"
		if os.Getenv(requireBrowserEnv) == "1" {
			t.Fatalf("%s (%s=1, so this is a failure, not a skip)", msg, requireBrowserEnv)
		}
		t.Skip(msg)
	}
	profile := t.TempDir()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("disable-gpu", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("no-default-browser-check", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-extensions", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(width, height),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelTab := chromedp.NewContext(actx, chromedp.WithLogf(t.Logf))
	ctx, cancelTime := context.WithTimeout(ctx, browserTimeout)
	t.Cleanup(func() {
		cancelTime()
		cancelTab()
		cancelAlloc()
	})
	b := &tab{t: t, ctx: ctx, downloads: t.TempDir()}
	var problems []string
	var mu sync.Mutex
	t.Cleanup(func() {
		mu.Lock()
		defer mu.Unlock()
		for _, p := range problems {
			t.Error(p)
		}
	})
	if err := chromedp.Listen(ctx, func(ev any) {
		switch e := ev.(type) {
		case *cdppage.EventJavascriptDialogOpening:
			b.dialogs.Add(1)
			mu.Lock()
			problems = append(problems, fmt.Sprintf("a JavaScript dialog opened: %s %q", e.Type, e.Message))
			mu.Unlock()
			go func() {
				_, _ = chromedp.Call(ctx, cdppage.HandleJavaScriptDialog, cdppage.HandleJavaScriptDialogParams{Accept: false})
			}()
		case *runtime.EventExceptionThrown:
			mu.Lock()
			d := e.ExceptionDetails
			msg := d.Text
			if d.Exception != nil && d.Exception.Description != "" {
				msg = d.Exception.Description
			}
			problems = append(problems, fmt.Sprintf("the page threw at %s:%d: %s", d.URL, d.LineNumber+1, msg))
			mu.Unlock()
		}
	}); err != nil {
		t.Fatal(err)
	}
	b.do(chromedp.EmulateViewport(int64(width), int64(height)),
		chromedp.Func(func(ctx context.Context, _ *chromedp.Target) error {
			if _, err := chromedp.Call(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
				Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: b.downloads}); err != nil {
				return err
			}
			// a screenshot of the whole page is then as wide as the window, as on a phone
			_, err := chromedp.Call(ctx, emulation.SetScrollbarsHidden, emulation.SetScrollbarsHiddenParams{Hidden: true})
			return err
		}))
	return b
}

// do runs actions in the tab and fails the test on an error.
func (b *tab) do(actions ...chromedp.Action[chromedp.Void]) {
	b.t.Helper()
	if err := chromedp.Do(b.ctx, actions...); err != nil {
		b.t.Fatal(err)
	}
}

// eval evaluates a JavaScript expression (a promise is awaited) and returns its value.
func eval[T any](b *tab, expr string) T {
	b.t.Helper()
	v, err := chromedp.Run(b.ctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
	if err != nil {
		b.t.Fatalf("evaluating %.80s: %v", expr, err)
	}
	return v
}

// text is the text content of the element the CSS selector sel finds.
func (b *tab) text(sel string) string {
	b.t.Helper()
	return eval[string](b, fmt.Sprintf(`(document.querySelector(%q) || {textContent: ""}).textContent`, sel))
}

// waitText waits until the text of the elements sel finds contains want, and returns it.
func (b *tab) waitText(sel, want string) string {
	b.t.Helper()
	deadline := time.Now().Add(60 * time.Second)
	var s string
	for time.Now().Before(deadline) {
		got := eval[[]string](b, fmt.Sprintf(`Array.from(document.querySelectorAll(%q)).map(e => e.textContent)`, sel))
		s = strings.Join(got, "\n")
		if strings.Contains(s, want) {
			return s
		}
		time.Sleep(100 * time.Millisecond)
	}
	b.t.Fatalf("%s does not say %q within a minute; it says %.600q (status: %q)", sel, want, s, b.text("#status"))
	return ""
}

// waitTrue waits until the JavaScript expression is true.
func (b *tab) waitTrue(expr string) {
	b.t.Helper()
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) {
		if eval[bool](b, expr) {
			return
		}
		time.Sleep(100 * time.Millisecond)
	}
	b.t.Fatalf("%s is not true within a minute (status: %q)", expr, b.text("#status"))
}

// change sets the value of a form control and fires its change event, as a person choosing
// an option does.
func (b *tab) change(sel, value string) {
	b.t.Helper()
	b.do(chromedp.SetValue(chromedp.CSS(sel), value))
	eval[bool](b, fmt.Sprintf(`document.querySelector(%q).dispatchEvent(new Event("change", {bubbles: true}))`, sel))
}

// download waits for a file named name in the download folder and returns its path.
func (b *tab) download(name string) string {
	b.t.Helper()
	p := filepath.Join(b.downloads, name)
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) {
		if st, err := os.Stat(p); err == nil && st.Size() > 0 {
			if _, err := os.Stat(p + ".crdownload"); err != nil {
				return p
			}
		}
		time.Sleep(100 * time.Millisecond)
	}
	entries, _ := os.ReadDir(b.downloads)
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	b.t.Fatalf("no download %s within a minute; the folder holds %v (status: %q)", name, names, b.text("#status"))
	return ""
}

// screenshot saves the whole page as PNG into the test's folder, and a copy into the folder
// $FLUECELL_SCREENSHOTS names.
func (b *tab) screenshot(name string) string {
	b.t.Helper()
	png, err := chromedp.Run(b.ctx, chromedp.FullScreenshot(100))
	if err != nil {
		b.t.Fatal(err)
	}
	p := filepath.Join(b.t.TempDir(), name)
	if err := os.WriteFile(p, png, 0o644); err != nil {
		b.t.Fatal(err)
	}
	if dir := os.Getenv(shotsEnv); dir != "" {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			b.t.Fatalf("%s: %v", shotsEnv, err)
		}
		if err := os.WriteFile(filepath.Join(dir, name), png, 0o644); err != nil {
			b.t.Fatalf("%s: %v", shotsEnv, err)
		}
	}
	b.t.Logf("screenshot %s (%d bytes)", p, len(png))
	return p
}
