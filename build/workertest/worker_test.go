// Package workertest runs the edge worker locally under workerd (through the
// pinned wrangler in build/node/node_modules) and checks what it serves. `make
// test-worker` prepares everything and runs it with LOTLENS_WORKER_TEST=1;
// other runs skip it.
package workertest

import (
	"bytes"
	"fmt"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"lotlens/build/web/sitecheck"
	"lotlens/build/web/stored"
	"lotlens/build/web/stored/storecheck"
)

// lockedBuffer collects the worker's output.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

func TestWorkerServesSite(t *testing.T) {
	root, wrangler := prepare(t)
	config := os.Getenv("LOTLENS_WORKER_CONFIG") // build/worker/wrangler.assets.jsonc for a worker built with -assets
	if config == "" {
		config = "build/worker/wrangler.jsonc"
	}
	base, out := startWorker(t, root, wrangler, config)
	start := time.Now()
	sitecheck.Run(t, base, filepath.Join(root, "build/worker/dist"))
	t.Logf("checks against the worker took %v", time.Since(start).Round(time.Millisecond))
	// Without the KV binding the store is off: its endpoints are 404.
	for _, p := range []string{"/api/share", "/api/share/AAAAAAAAAAAAAAAAAAAAAA", "/s/AAAAAAAAAAAAAAAAAAAAAA"} {
		res, err := http.Get(base + p)
		if err != nil {
			t.Fatal(err)
		}
		res.Body.Close()
		if res.StatusCode != 404 {
			t.Errorf("%s: status %d without the KV binding", p, res.StatusCode)
		}
	}
	if t.Failed() {
		t.Logf("wrangler output:\n%s", out.String())
	}
}

// TestWorkerStoredLinks runs the worker with its KV binding
// (wrangler.stored.jsonc) under wrangler dev with its local KV, and checks
// the encrypted store end to end: store, fetch, decrypt, wrong key,
// delete, expired, oversized, rate limited, bad ids, strict input, headers.
func TestWorkerStoredLinks(t *testing.T) {
	root, wrangler := prepare(t)
	if os.Getenv("LOTLENS_WORKER_CONFIG") != "" {
		t.Skip("the stored link is checked with the default worker")
	}
	const perHour = 8
	base, out := startWorker(t, root, wrangler, "build/worker/wrangler.stored.jsonc",
		"--var", "LOTLENS_SHARE_TEST:1", "--var", fmt.Sprintf("LOTLENS_SHARE_PER_HOUR:%d", perHour),
		"--persist-to", t.TempDir())
	storecheck.Run(t, base, stored.Defaults.MaxBytes, perHour)
	if t.Failed() {
		t.Logf("wrangler output:\n%s", out.String())
	}
}

func prepare(t *testing.T) (root, wrangler string) {
	if os.Getenv("LOTLENS_WORKER_TEST") != "1" {
		t.Skip("set LOTLENS_WORKER_TEST=1 (make test-worker does) to run the edge worker under workerd")
	}
	root, _ = filepath.Abs("../..")
	wrangler = filepath.Join(root, "build", "node", "node_modules", ".bin", "wrangler")
	for _, need := range []struct{ path, how string }{
		{wrangler, "run `npm ci --prefix build/node` (make test-worker does)"},
		{filepath.Join(root, "build/worker/build/app.wasm"), "run `go run ./build worker` (make test-worker does)"},
		{filepath.Join(root, "build/worker/dist/index.html"), "run `go run ./build worker` (make test-worker does)"},
	} {
		if _, err := os.Stat(need.path); err != nil {
			t.Fatalf("%s is missing: %s", need.path, need.how)
		}
	}
	return root, wrangler
}

// startWorker starts wrangler dev with config in its own process group,
// waits until it serves, and stops it when the test ends. The ports are
// found free just before the start, so another process (workerd's own
// sockets among them) may take one in between: on "Address already in use"
// it tries again with new ports, up to three times.
func startWorker(t *testing.T, root, wrangler, config string, extra ...string) (string, *lockedBuffer) {
	t.Helper()
	for attempt := 1; ; attempt++ {
		url, out, busy := startWorkerOnce(t, root, wrangler, config, attempt == 3, extra...)
		if !busy {
			return url, out
		}
		t.Logf("wrangler dev found its port taken (attempt %d); trying other ports", attempt)
	}
}

// startWorkerOnce is one attempt of startWorker; busy reports a port
// already in use (the test fails instead when last is set).
func startWorkerOnce(t *testing.T, root, wrangler, config string, last bool, extra ...string) (string, *lockedBuffer, bool) {
	port := freePort(t)
	args := append([]string{"dev", "--config", config, "--ip", "127.0.0.1", "--port", fmt.Sprint(port),
		"--inspector-port", fmt.Sprint(freePort(t)), "--show-interactive-dev-session=false", "--log-level", "info"}, extra...)
	cmd := exec.Command(wrangler, args...)
	cmd.Dir = root
	cmd.Env = append(os.Environ(), "WRANGLER_SEND_METRICS=false", "CI=1", "NO_COLOR=1")
	// Its own process group, so that stopping it also stops the workerd it starts.
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	out := &lockedBuffer{}
	cmd.Stdout, cmd.Stderr = out, out
	if err := cmd.Start(); err != nil {
		t.Fatalf("starting wrangler: %v", err)
	}
	pid := cmd.Process.Pid
	exited := make(chan struct{})
	go func() { cmd.Wait(); close(exited) }()
	t.Cleanup(func() {
		syscall.Kill(-pid, syscall.SIGTERM)
		select {
		case <-exited:
		case <-time.After(10 * time.Second):
			syscall.Kill(-pid, syscall.SIGKILL)
			<-exited
		}
	})
	deadline := time.Now().Add(120 * time.Second)
	ready := false
	for time.Now().Before(deadline) && !ready {
		select {
		case <-exited:
			if !last && strings.Contains(out.String(), "Address already in use") {
				return "", out, true
			}
			t.Fatalf("wrangler dev stopped before it was ready:\n%s", out.String())
		case <-time.After(250 * time.Millisecond):
		}
		if strings.Contains(out.String(), "Ready on") {
			if c, err := net.DialTimeout("tcp", fmt.Sprintf("127.0.0.1:%d", port), time.Second); err == nil {
				c.Close()
				ready = true
			}
		}
	}
	if !ready {
		t.Fatalf("wrangler dev was not ready after 120 s:\n%s", out.String())
	}
	return fmt.Sprintf("http://127.0.0.1:%d", port), out, false
}

func freePort(t *testing.T) int {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}
