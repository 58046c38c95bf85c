// Package headless starts headless Chromium for the browser tests of the
// page (package site) and of the edge worker (build/workertest): one fresh
// profile per browser, the flags that keep Chromium from contacting other
// hosts on its own, and a failed test for any JavaScript dialog (an alert
// would mean pasted content ran as script). Test helper only: nothing in
// the product imports it.
package headless

import (
	"context"
	"fmt"
	"os"
	"testing"
	"time"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// Exe is the Chromium to run: $CHROMIUM, else /usr/bin/chromium.
func Exe() string {
	if exe := os.Getenv("CHROMIUM"); exe != "" {
		return exe
	}
	return "/usr/bin/chromium"
}

// Check says what to do when Chromium is missing (nil when it is there).
func Check() error {
	if _, err := os.Stat(Exe()); err != nil {
		return fmt.Errorf("Chromium is missing at %s: run `make deps-browser` or set CHROMIUM", Exe())
	}
	return nil
}

// Start starts Chromium with a fresh profile (removed after the test) and
// a 1024x768 window, and returns a browser context that ends after
// timeout; extra options are added after the defaults. Everything is
// stopped when the test ends.
func Start(t testing.TB, timeout time.Duration, extra ...chromedp.ExecAllocatorOption) context.Context {
	t.Helper()
	// The profile is removed after Chromium exits (t.TempDir's own cleanup
	// can race Chromium's last writes).
	profile, err := os.MkdirTemp("", "lotlens-chromium-")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(profile) })
	opts := append([]chromedp.ExecAllocatorOption{}, chromedp.DefaultExecAllocatorOptions[:]...)
	opts = append(opts,
		chromedp.ExecPath(Exe()),
		chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-domain-reliability", true),
		chromedp.Flag("no-pings", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1024, 768),
	)
	opts = append(opts, extra...)
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelC := chromedp.NewContext(actx)
	ctx, cancelT := context.WithTimeout(ctx, timeout)
	t.Cleanup(func() { cancelT(); cancelC(); cancelA() })
	// Any alert() would mean script injection: fail and dismiss it.
	chromedp.ListenTarget(ctx, func(ev any) {
		if d, ok := ev.(*page.EventJavascriptDialogOpening); ok {
			t.Errorf("a JavaScript dialog opened: %q (script injection?)", d.Message)
			go chromedp.Run(ctx, page.HandleJavaScriptDialog(false))
		}
	})
	return ctx
}
