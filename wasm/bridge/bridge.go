// Package bridge is the logic behind the WebAssembly entry points, kept free
// of syscall/js so that it builds and tests natively. package main in ../
// binds these calls to JavaScript names; nothing else lives there.
//
// A Session holds the state of one page's engine worker: a file being read in
// chunks (hashed with SHA-256 as it arrives), and the last table read, so that
// a change of settings re-runs only the analysis, never the reading.
package bridge

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"hash"

	"lotlens/stats"
	"lotlens/stats/chart"
	"lotlens/stats/ingest"
)

// Session is one engine's state. The zero value is ready to use. It is not
// safe for concurrent use (a Web Worker is single-threaded).
type Session struct {
	// reading
	active bool
	name   string
	h      hash.Hash
	rd     *chunkReader
	read   int64
	// last table read from a file
	tab *ingest.Table
	fp  string
}

// Begin starts reading a file called name of size bytes (0 if unknown),
// dropping any earlier read.
func (s *Session) Begin(name string, size int64) {
	s.Cancel()
	s.active, s.name, s.h, s.rd, s.read = true, name, sha256.New(), newChunkReader(size), 0
}

// Write feeds the next chunk of the file. It returns the bytes read so far.
func (s *Session) Write(p []byte) (int64, error) {
	if !s.active {
		return 0, errors.New("no file is being read: call begin first")
	}
	s.h.Write(p)
	if err := s.rd.Write(p); err != nil {
		s.Cancel()
		return 0, err
	}
	s.read += int64(len(p))
	return s.read, nil
}

// End finishes reading and keeps the table for Analyze. It returns JSON:
// {"name","bytes","fingerprint","columns","summary"} or {"error"}.
func (s *Session) End() []byte {
	if !s.active {
		return stats.ErrorJSON(errors.New("no file is being read"))
	}
	tab, err := s.rd.Finish()
	fp := hex.EncodeToString(s.h.Sum(nil))
	name, n := s.name, s.read
	s.active, s.rd, s.h = false, nil, nil
	if err != nil {
		s.tab, s.fp = nil, ""
		return stats.ErrorJSON(fmt.Errorf("%s: %w", name, err))
	}
	s.tab, s.fp = tab, fp
	cols := make([]ingest.ColumnInfo, 0, len(tab.Columns))
	for _, c := range tab.Columns {
		cols = append(cols, c.ColumnInfo)
	}
	return mustJSON(map[string]any{"name": name, "bytes": n, "fingerprint": fp, "columns": cols, "summary": tab.Summary()})
}

// Cancel abandons a read in progress. The last complete table is dropped too
// only when a new read begins.
func (s *Session) Cancel() {
	s.active, s.rd, s.h, s.read = false, nil, nil, 0
}

// HasTable reports whether a file's table is kept for re-analysis.
func (s *Session) HasTable() bool { return s.tab != nil }

// Forget drops the kept table (the user pasted text instead).
func (s *Session) Forget() { s.tab, s.fp = nil, "" }

// Analyze runs the request. With useTable it analyses the kept table (the
// request's Text and Cells are ignored); otherwise the request's own data.
// It returns the report as JSON (or {"error": "..."}) and its charts as SVG
// text keyed by chart name (nil on error). The charts travel beside the JSON
// rather than inside it: JSON-escaping SVG costs time and size.
func (s *Session) Analyze(reqJSON []byte, useTable bool) ([]byte, map[string]string) {
	req, err := stats.ParseRequest(reqJSON)
	if err != nil {
		return stats.ErrorJSON(err), nil
	}
	var rep *stats.Report
	if useTable {
		if s.tab == nil {
			return stats.ErrorJSON(errors.New("no file is loaded: drop or pick the file again")), nil
		}
		rep, err = stats.AnalyzeTable(s.tab, s.fp, req)
	} else {
		rep, err = stats.Analyze(req)
	}
	if err != nil {
		return stats.ErrorJSON(err), nil
	}
	return stats.ReportJSON(rep, nil), chart.All(rep)
}

func mustJSON(v any) []byte {
	b, err := json.Marshal(v)
	if err != nil {
		return stats.ErrorJSON(fmt.Errorf("internal error encoding the result: %v", err))
	}
	return b
}
