package main

import (
	"bytes"
	"compress/gzip"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
)

// buildWorker prepares the edge worker in build/worker: copies the built
// site (distDir) to build/worker/dist (the go:embed source, or with assets
// the static-asset directory), writes the JavaScript glue of
// github.com/syumai/workers into build/worker/build, and compiles the worker
// to build/worker/build/app.wasm. It prints the worker's size, raw and
// gzip-compressed.
func buildWorker(distDir string, assets bool) error {
	if _, err := os.Stat(filepath.Join(distDir, "index.html")); err != nil {
		return fmt.Errorf("%s is not built: run `go run ./build dist` first (%v)", distDir, err)
	}
	const wdir = "build/worker"
	embedDir := filepath.Join(wdir, "dist")
	if err := os.RemoveAll(embedDir); err != nil {
		return err
	}
	if err := copyTree(distDir, embedDir); err != nil {
		return err
	}
	gen := exec.Command("go", "run", "github.com/syumai/workers/cmd/workers-assets-gen", "-mode=go", "-o", filepath.Join(wdir, "build"))
	if b, err := gen.CombinedOutput(); err != nil {
		return fmt.Errorf("workers-assets-gen: %v\n%s", err, b)
	}
	wasm := filepath.Join(wdir, "build", "app.wasm")
	args := []string{"build", "-trimpath", "-buildvcs=false", "-ldflags=-s -w", "-o", wasm}
	if assets {
		args = append(args, "-tags", "lotlens_assets")
	}
	cc := exec.Command("go", append(args, "./"+wdir)...)
	cc.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if b, err := cc.CombinedOutput(); err != nil {
		return fmt.Errorf("compiling the worker: %v\n%s", err, b)
	}
	b, err := os.ReadFile(wasm)
	if err != nil {
		return err
	}
	var gz bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
	zw.Write(b)
	zw.Close()
	var site int64
	filepath.WalkDir(embedDir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			if info, err := d.Info(); err == nil {
				site += info.Size()
			}
		}
		return nil
	})
	mode, config := "site embedded", "build/worker/wrangler.jsonc"
	if assets {
		mode, config = "site in the static-asset binding", "build/worker/wrangler.assets.jsonc"
	}
	fmt.Printf("worker (%s): %s is %.2f MB raw, %.2f MB gzip -9; site %.2f MB incl. .br/.gz; run with --config %s\n",
		mode, wasm, mb(len(b)), mb(gz.Len()), float64(site)/1e6, config)
	return nil
}

func mb(n int) float64 { return float64(n) / 1e6 }

func copyTree(src, dst string) error {
	return filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		t := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(t, 0o755)
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(t, b, 0o644)
	})
}
