package site

// Browser tests: the built site (dist/, made by `make dist`) served with the
// worker's headers, driven in headless Chromium through chromedp. `make test`
// runs them; `go test -short` skips them.

import (
	"context"
	"fmt"
	"math"
	"net/http/httptest"
	"os"
	"os/exec"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"lotlens/build/dist"
	"lotlens/stats"
)

const distDir = "../dist"

// browser serves dist/ and starts headless Chromium; it returns a chromedp
// context and the site's base URL.
func browser(t *testing.T) (context.Context, string) {
	t.Helper()
	if testing.Short() {
		t.Skip("browser tests skipped with -short")
	}
	if _, err := os.Stat(distDir + "/lotlens.wasm"); err != nil {
		t.Fatalf("dist/ is not built: run `make dist` first (%v)", err)
	}
	exe := os.Getenv("CHROMIUM")
	if exe == "" {
		exe = "/usr/bin/chromium"
	}
	if _, err := exec.LookPath(exe); err != nil {
		t.Fatalf("Chromium not found at %s: install it (Debian: apt-get install chromium) or set CHROMIUM", exe)
	}
	srv := httptest.NewServer(dist.Handler(distDir))
	t.Cleanup(srv.Close)
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe),
		chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU, chromedp.NoFirstRun,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-quic", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1024, 768),
	}
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelC := chromedp.NewContext(actx)
	ctx, cancelT := context.WithTimeout(ctx, 60*time.Second)
	t.Cleanup(func() { cancelT(); cancelC(); cancelA() })
	return ctx, srv.URL
}

// TestPasteShowsEngineNumbers pastes values into the page and checks that the
// figures shown equal the engine's own (run natively here).
func TestPasteShowsEngineNumbers(t *testing.T) {
	ctx, base := browser(t)
	// NIST StRD Michelso (testdata/nist): the engine's native answer is the check value.
	data, err := os.ReadFile("../testdata/nist/Michelso.dat")
	if err != nil {
		t.Fatal(err)
	}
	want, err := stats.Analyze(stats.Request{Text: string(data)})
	if err != nil {
		t.Fatal(err)
	}
	var n, mean, median, sd string
	err = chromedp.Run(ctx,
		chromedp.Navigate(base+"/"),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
		chromedp.SetValue("#data", string(data), chromedp.ByID),
		chromedp.Click("#analyse", chromedp.ByID),
		chromedp.WaitVisible(`#report`, chromedp.ByID),
		chromedp.Text("#n", &n, chromedp.ByID),
		chromedp.Text("#mean", &mean, chromedp.ByID),
		chromedp.Text("#median", &median, chromedp.ByID),
		chromedp.Text("#sd", &sd, chromedp.ByID),
	)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, got string
		want      float64
	}{
		{"n", n, float64(want.Counts.Used)},
		{"mean", mean, want.Centre.Mean},
		{"median", median, want.Centre.Median},
		{"sd", sd, want.Spread.SD},
	} {
		got, err := strconv.ParseFloat(c.got, 64)
		if err != nil || got != c.want {
			t.Errorf("page shows %s = %q, engine says %s", c.name, c.got, fmt.Sprint(c.want))
		}
	}
	// And against NIST's certified values for Michelso, to 12 digits.
	for _, c := range []struct {
		name, got string
		want      float64
	}{{"mean", mean, 299.852400000000}, {"sd", sd, 0.0790105478190518}} {
		got, _ := strconv.ParseFloat(c.got, 64)
		if math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("page shows %s = %q, NIST certifies %.15g", c.name, c.got, c.want)
		}
	}
}
