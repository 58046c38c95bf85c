package site

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"testing"

	"lotlens/build/dist"
	"lotlens/site/headless"
)

// TestMain prepares what the browser tests need. `make test-browser` (and
// make test, make bench-page) builds dist/ and installs Chromium first. With
// plain `go test ./...` on a fresh clone, where dist/ is not built, the site
// is built here into a temporary directory (about 20 s); without Chromium
// the package stops with one line saying what to run. -short skips the
// browser tests and needs neither.
func TestMain(m *testing.M) {
	flag.Parse()
	if testing.Short() {
		os.Exit(m.Run())
	}
	exe := headless.Exe()
	if _, err := exec.LookPath(exe); err != nil {
		fmt.Printf("site: the browser tests need Chromium (not found at %s): run make test-browser, which installs it, or set CHROMIUM; go test -short skips them\n", exe)
		os.Exit(1)
	}
	if _, err := os.Stat(distDir + "/index.html"); err != nil {
		if os.Getenv("LOTLENS_DIST") != "" {
			fmt.Printf("site: LOTLENS_DIST=%s holds no built site: run go run ./build dist -out %s\n", distDir, distDir)
			os.Exit(1)
		}
		tmp, err := os.MkdirTemp("", "lotlens-dist-")
		if err != nil {
			fmt.Println("site:", err)
			os.Exit(1)
		}
		if err := dist.BuildWith("..", tmp, dist.Options{}); err != nil {
			fmt.Printf("site: dist/ is not built and building it failed (%v): run make dist\n", err)
			os.RemoveAll(tmp)
			os.Exit(1)
		}
		distDir = tmp
		code := m.Run()
		os.RemoveAll(tmp)
		os.Exit(code)
	}
	os.Exit(m.Run())
}
