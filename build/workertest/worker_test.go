// Package workertest runs the edge worker locally under workerd (through the
// pinned wrangler in build/node/node_modules) and checks what it serves. `make
// test-worker` prepares everything and runs it with LOTLENS_WORKER_TEST=1;
// other runs skip it.
package workertest

import (
	"bytes"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"lotlens/build/web/sitecheck"
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
	if os.Getenv("LOTLENS_WORKER_TEST") != "1" {
		t.Skip("set LOTLENS_WORKER_TEST=1 (make test-worker does) to run the edge worker under workerd")
	}
	root, _ := filepath.Abs("../..")
	wrangler := filepath.Join(root, "build", "node", "node_modules", ".bin", "wrangler")
	for _, need := range []struct{ path, how string }{
		{wrangler, "run `npm ci --prefix build/node` (make test-worker does)"},
		{filepath.Join(root, "build/worker/build/app.wasm"), "run `go run ./build worker` (make test-worker does)"},
		{filepath.Join(root, "build/worker/dist/index.html"), "run `go run ./build worker` (make test-worker does)"},
	} {
		if _, err := os.Stat(need.path); err != nil {
			t.Fatalf("%s is missing: %s", need.path, need.how)
		}
	}
	config := os.Getenv("LOTLENS_WORKER_CONFIG") // build/worker/wrangler.assets.jsonc for a worker built with -assets
	if config == "" {
		config = "build/worker/wrangler.jsonc"
	}
	port := freePort(t)
	cmd := exec.Command(wrangler, "dev", "--config", config, "--ip", "127.0.0.1", "--port", fmt.Sprint(port),
		"--inspector-port", fmt.Sprint(freePort(t)), "--show-interactive-dev-session=false", "--log-level", "info")
	cmd.Dir = root
	cmd.Env = append(os.Environ(), "WRANGLER_SEND_METRICS=false", "CI=1", "NO_COLOR=1")
	// Its own process group, so that stopping it also stops the workerd it starts.
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	var out lockedBuffer
	cmd.Stdout, cmd.Stderr = &out, &out
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
	start := time.Now()
	sitecheck.Run(t, fmt.Sprintf("http://127.0.0.1:%d", port), filepath.Join(root, "build/worker/dist"))
	t.Logf("checks against the worker took %v", time.Since(start).Round(time.Millisecond))
	if t.Failed() {
		t.Logf("wrangler output:\n%s", out.String())
	}
}

func freePort(t *testing.T) int {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}
