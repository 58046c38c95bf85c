package share

import (
	"flag"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite testdata/share/sample.* from samplePayload")

func readSample(name string) ([]byte, error) {
	return os.ReadFile(filepath.Join("..", "..", "testdata", "share", name))
}

// TestWriteSamples rewrites the committed samples with -update. Do so only
// when the format version changes: TestSamples holds format 1 to its word.
func TestWriteSamples(t *testing.T) {
	if !*update {
		t.Skip("run with -update to rewrite the samples")
	}
	s, err := Encode(samplePayload())
	if err != nil {
		t.Fatal(err)
	}
	f, err := EncodeFile(samplePayload())
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join("..", "..", "testdata", "share")
	if err := os.WriteFile(filepath.Join(dir, "sample.link"), []byte(s+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "sample"+FileExt), f, 0o644); err != nil {
		t.Fatal(err)
	}
}
