package bridge

import (
	"os"
	"os/exec"
	"regexp"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// initBytesMax bounds what each of the engine's packages may allocate in
// its package initialisation: a few error values and small copies, no
// tables or maps built at start (see "Start-up" in DEVELOPERS.md). Before
// the start-up work, stats/ingest allocated 29,800 bytes at init (its unit
// map) and stats 4,928.
const initBytesMax = 1024

// TestEnginePackageInitsAreSmall runs this test binary again with
// GODEBUG=inittrace=1, which makes the Go runtime report each package's
// initialisation (its clock time and its allocations), and holds every
// lotlens/stats package below initBytesMax bytes. Allocations, not the
// clock, are checked: they do not depend on the machine's load. The
// engine in the browser runs these inits before it can say "ready".
func TestEnginePackageInitsAreSmall(t *testing.T) {
	if os.Getenv("LOTLENS_INITTRACE_CHILD") != "" {
		return
	}
	if runtime.GOOS == "js" {
		t.Skip("js/wasm cannot start a process; the packages' inits are the same code natively")
	}
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), "GODEBUG=inittrace=1", "LOTLENS_INITTRACE_CHILD=1")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("%v: %s", err, out)
	}
	line := regexp.MustCompile(`(?m)^init (lotlens/stats\S*) @\S+ ms, \S+ ms clock, (\d+) bytes, (\d+) allocs`)
	seen := 0
	for _, m := range line.FindAllSubmatch(out, -1) {
		seen++
		b, _ := strconv.Atoi(string(m[2]))
		if b > initBytesMax {
			t.Errorf("package %s allocates %d bytes (%s allocations) at init, more than %d: build its tables on first use (sync.OnceValue) or as literals", m[1], b, m[3], initBytesMax)
		}
	}
	// a package without init work prints no line; stats/ingest, stats/share
	// and stats/method keep a few error values, so some lines must be there
	// (else the trace's format changed and this test sees nothing)
	if seen == 0 {
		t.Fatalf("no init lines for lotlens/stats packages in the trace:\n%s", out)
	}
}

// leftOut lists packages the engine does without (each with the packages
// below it), with what to use instead. Each cost bytes of the WebAssembly
// engine, which the browser downloads and decodes before "ready".
var leftOut = []struct{ path, instead string }{
	// crypto/sha256 brings the FIPS 140 module with it (239 KB of the
	// engine, 54 KB of its brotli download)
	{"crypto", "lotlens/stats/digest for SHA-256"},
	// distuv imports gonum's stat, which brings mat, lapack, blas and
	// convex/lp, and mat sets up its pools at start (37 KB, 0.6-1.7 ms of
	// package init in Node)
	{"gonum.org/v1/gonum/stat", "the distribution functions in stats/method/dist.go"},
	{"gonum.org/v1/gonum/mat", "the distribution functions in stats/method/dist.go"},
}

// TestEngineLeavesOut keeps the packages in leftOut out of the engine.
func TestEngineLeavesOut(t *testing.T) {
	if runtime.GOOS == "js" {
		t.Skip("js/wasm cannot start a process; the check runs natively")
	}
	cmd := exec.Command("go", "list", "-deps", "lotlens/wasm")
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v: %s", err, out)
	}
	deps := strings.Fields(string(out))
	for _, want := range []string{"lotlens/stats/digest", "gonum.org/v1/gonum/mathext"} {
		if !slices.Contains(deps, want) {
			t.Fatalf("the engine's dependencies do not list %s: %v", want, deps)
		}
	}
	for _, d := range deps {
		for _, l := range leftOut {
			if d == l.path || strings.HasPrefix(d, l.path+"/") {
				t.Errorf("the engine imports %s: use %s", d, l.instead)
			}
		}
	}
}
