// Package dist builds the static site into a directory and serves it with the
// headers the edge worker sends. The build command (package main in ../) and
// the browser tests use it.
//
// The build, in order: read site/; compile the engine to WebAssembly (optionally
// through wasm-opt); copy wasm_exec.js from the
// same Go; render site/help/*.md into the help layout, running the worked
// examples through the engine; fingerprint asset names and rewrite the
// references; fill in the service worker's build id and file list; check every
// link; precompress (gzip and brotli); write dist/. The same input gives the
// same bytes.
package dist

import (
	"bytes"
	"compress/gzip"
	"fmt"
	"io"
	"io/fs"
	"net/http"
	"os"
	"os/exec"
	"path"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/andybalholm/brotli"

	"lotlens/build/web"
)

// Log receives the build's warnings (example fields the engine did not give).
var Log io.Writer = os.Stderr

// Options tune the build.
type Options struct {
	// WasmOpt is "off" (the default: measured, it does not shrink the
	// compressed wasm, see DEVELOPERS.md), "on" (require wasm-opt) or "auto"
	// (use it when it is on PATH).
	WasmOpt string
}

// Build compiles the engine to WebAssembly and writes the site from root's
// site/ into out, replacing it. LOTLENS_WASM_OPT=on|auto|off (default off)
// chooses whether wasm-opt shrinks the wasm.
func Build(root, out string) error {
	o := Options{WasmOpt: os.Getenv("LOTLENS_WASM_OPT")}
	return BuildWith(root, out, o)
}

// BuildWith is Build with explicit options.
func BuildWith(root, out string, o Options) error {
	site, err := Assemble(root, o)
	if err != nil {
		return err
	}
	return write(site, out)
}

// Assemble makes the whole site in memory, compressed variants included.
func Assemble(root string, o Options) (files, error) {
	site, err := readSite(filepath.Join(root, "site"))
	if err != nil {
		return nil, err
	}
	wasm, err := compileWasm(root, o)
	if err != nil {
		return nil, err
	}
	site["lotlens.wasm"] = wasm
	// wasm_exec.js must come from the Go that built the wasm.
	wexec, err := os.ReadFile(filepath.Join(goroot(root), "lib", "wasm", "wasm_exec.js"))
	if err != nil {
		return nil, err
	}
	site["wasm_exec.js"] = wexec

	pages, err := loadHelp(site)
	if err != nil {
		return nil, err
	}
	for _, p := range pages {
		b, missing, err := renderHelp(p)
		if err != nil {
			return nil, err
		}
		if len(missing) > 0 {
			fmt.Fprintf(Log, "build: help/%s.md: the engine does not give %s for the example data (shown as not given)\n", p.Slug, strings.Join(missing, ", "))
		}
		delete(site, "help/"+p.Slug+".md")
		site["help/"+p.Slug+".html"] = b
	}
	if _, ok := site["help/help.css"]; !ok {
		site["help/help.css"] = helpCSS
	}
	if _, ok := site["404.html"]; !ok {
		b, err := notFoundPage()
		if err != nil {
			return nil, err
		}
		site["404.html"] = b
	}
	if err := bundleModules(site, "app.js"); err != nil {
		return nil, err
	}
	if _, err := fingerprint(site); err != nil {
		return nil, err
	}
	if err := fillServiceWorker(site); err != nil {
		return nil, err
	}
	if err := checkLinks(site); err != nil {
		return nil, err
	}
	if err := compress(site); err != nil {
		return nil, err
	}
	return site, nil
}

// readSite reads the page's files: everything under site/ except Go files,
// dotfiles and Markdown outside help/.
func readSite(dir string) (files, error) {
	site := files{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		rel = filepath.ToSlash(rel)
		if strings.HasPrefix(d.Name(), ".") && rel != "." {
			if d.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		if d.IsDir() {
			return nil
		}
		if strings.HasSuffix(rel, ".go") || (strings.HasSuffix(rel, ".md") && !strings.HasPrefix(rel, "help/")) {
			return nil
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		site[rel] = b
		return nil
	})
	return site, err
}

func goroot(root string) string {
	cmd := exec.Command("go", "env", "GOROOT")
	cmd.Dir = root
	if b, err := cmd.Output(); err == nil && len(bytes.TrimSpace(b)) > 0 {
		return string(bytes.TrimSpace(b))
	}
	return runtime.GOROOT()
}

// compileWasm builds ./wasm for js/wasm, reproducibly (-trimpath, no VCS
// stamp, no symbol tables), and runs wasm-opt over it when asked or present.
func compileWasm(root string, o Options) ([]byte, error) {
	tmp, err := os.MkdirTemp("", "lotlens-wasm-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(tmp)
	raw := filepath.Join(tmp, "lotlens.wasm")
	cmd := exec.Command("go", "build", "-trimpath", "-buildvcs=false", "-ldflags=-s -w", "-o", raw, "./wasm")
	cmd.Dir = root
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if b, err := cmd.CombinedOutput(); err != nil {
		return nil, fmt.Errorf("compiling the wasm: %v\n%s", err, b)
	}
	mode := o.WasmOpt
	if mode == "" {
		mode = "off"
	}
	switch mode {
	case "off":
		return os.ReadFile(raw)
	case "auto", "on":
	default:
		return nil, fmt.Errorf("wasm-opt setting %q: use on, off or auto", mode)
	}
	wo, err := exec.LookPath("wasm-opt")
	if err != nil {
		if mode == "on" {
			return nil, fmt.Errorf("wasm-opt is not installed (Debian: apt-get install binaryen), or build with LOTLENS_WASM_OPT=off")
		}
		return os.ReadFile(raw)
	}
	opt := filepath.Join(tmp, "lotlens.opt.wasm")
	cmd = exec.Command(wo, WasmOptArgs(raw, opt)...)
	if b, err := cmd.CombinedOutput(); err != nil {
		return nil, fmt.Errorf("wasm-opt: %v\n%s", err, b)
	}
	return os.ReadFile(opt)
}

// WasmOptArgs are wasm-opt's arguments: size optimisation, with the features
// Go's wasm uses.
func WasmOptArgs(in, out string) []string {
	return []string{"-Oz", "--enable-bulk-memory", "--enable-sign-ext", "--enable-nontrapping-float-to-int", "--enable-mutable-globals", in, "-o", out}
}

// compress adds name.gz (gzip, best compression, no name or time in the
// header) and name.br (brotli quality 11) next to every compressible file
// where that is smaller.
func compress(site files) error {
	type job struct{ name, suffix string }
	var jobs []job
	for _, n := range site.names() {
		if web.Compressible(n) && len(site[n]) >= 256 {
			jobs = append(jobs, job{n, ".br"}, job{n, ".gz"})
		}
	}
	// Largest first, two at a time: the machines have two cores.
	sort.SliceStable(jobs, func(i, j int) bool { return len(site[jobs[i].name]) > len(site[jobs[j].name]) })
	results := make([][]byte, len(jobs))
	errs := make([]error, len(jobs))
	var wg sync.WaitGroup
	sem := make(chan struct{}, 2)
	for i, j := range jobs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			results[i], errs[i] = compressOne(site[j.name], j.suffix)
		}()
	}
	wg.Wait()
	for i, j := range jobs {
		if errs[i] != nil {
			return fmt.Errorf("compressing %s: %v", j.name, errs[i])
		}
		if len(results[i]) < len(site[j.name]) {
			site[j.name+j.suffix] = results[i]
		}
	}
	return nil
}

func compressOne(b []byte, suffix string) ([]byte, error) {
	var buf bytes.Buffer
	switch suffix {
	case ".gz":
		zw, err := gzip.NewWriterLevel(&buf, gzip.BestCompression)
		if err != nil {
			return nil, err
		}
		// Header left empty: no name, ModTime zero.
		if _, err := zw.Write(b); err != nil {
			return nil, err
		}
		if err := zw.Close(); err != nil {
			return nil, err
		}
	case ".br":
		bw := brotli.NewWriterLevel(&buf, brotli.BestCompression)
		if _, err := bw.Write(b); err != nil {
			return nil, err
		}
		if err := bw.Close(); err != nil {
			return nil, err
		}
	}
	return buf.Bytes(), nil
}

// write replaces out with the site.
func write(site files, out string) error {
	if err := os.RemoveAll(out); err != nil {
		return err
	}
	for _, n := range site.names() {
		dst := filepath.Join(out, filepath.FromSlash(n))
		if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(dst, site[n], 0o644); err != nil {
			return err
		}
	}
	return nil
}

// Headers are the security headers every response carries (the same map as
// web.Headers, which the edge worker uses).
var Headers = web.Headers

// Handler serves dir with Headers, the media types, the caching rule and the
// precompressed bodies: the same handler the edge worker runs.
func Handler(dir string) http.Handler {
	return web.Handler(os.DirFS(dir))
}

// Sizes lists the files of a built site with their sizes, largest first (for
// the size report).
func Sizes(dir string) ([]string, error) {
	var lines []string
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		info, err := d.Info()
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		lines = append(lines, fmt.Sprintf("%10d  %s", info.Size(), path.Clean(filepath.ToSlash(rel))))
		return nil
	})
	sort.Sort(sort.Reverse(sort.StringSlice(lines)))
	return lines, err
}
