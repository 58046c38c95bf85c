// Package bridge is the logic behind the WebAssembly entry points, kept free
// of syscall/js so that it builds and tests natively. package main in ../
// binds these calls to JavaScript names; nothing else lives there.
//
// A Session holds the state of one page's engine worker: a file being read in
// chunks (hashed with SHA-256 as it arrives), and the last table read, so that
// a change of settings re-runs only the analysis, never the reading.
//
// Every call returns an answer, never a Go panic: a panic inside the engine
// becomes the JSON error object {"error": "...", "code": "internal"} and the
// worker keeps running (a panic that escaped would end the Go program and
// the page would lose its engine).
package bridge

import (
	"encoding/json"
	"fmt"
	"unsafe"

	"lotlens/stats"
	"lotlens/stats/chart"
	"lotlens/stats/ingest"
	"lotlens/stats/share"
)

// ShareBytesMax is the largest file whose bytes the session keeps for a
// share payload (share.MaxDecoded, 64 MiB): a larger file cannot be shared
// by link or .lotlens file; the user sends the file itself.
const ShareBytesMax = share.MaxDecoded

// The bridge's errors are stats.Error values with the engine's codes
// (stats.CodeInternal for a caught panic, CodeCancelled, CodeNoFile,
// CodeTooLarge); ErrorJSON writes them and every other error.
var ErrorJSON = stats.ErrorJSON

// internal is the error for a caught panic.
func internal(where string, r any) *stats.Error {
	return &stats.Error{Code: stats.CodeInternal, Msg: fmt.Sprintf("internal error in the engine while %s (%v): nothing was lost and the page keeps working; please report this with the data if you can", where, r)}
}

// Session is one engine's state. The zero value is ready to use. It is not
// safe for concurrent use (a Web Worker is single-threaded).
type Session struct {
	// reading
	active    bool
	cancelled bool
	name      string
	rd        *chunkReader
	read      int64
	// last table read from a file (or opened from a shared payload)
	tab *ingest.Table
	fp  string
	// the bytes behind tab, exactly as read, for a share payload ("" when
	// the file was larger than ShareBytesMax: rawOver)
	raw     string
	rawOver bool
	srcName string

	// analyze replaces the engine in tests (nil: stats.Analyze and
	// stats.AnalyzeTable), to check that a panic becomes an error.
	analyze func(req stats.Request, tab *ingest.Table, fp string) (*stats.Report, error)
}

// Begin starts reading a file called name of size bytes (0 if unknown),
// dropping any earlier read.
func (s *Session) Begin(name string, size int64) {
	s.Cancel()
	s.active, s.cancelled, s.name, s.rd, s.read = true, false, name, newChunkReader(size, ShareBytesMax), 0
}

// Write feeds the next chunk of the file. It returns the bytes read so far.
// Its errors are *stats.Error or the reader's; ErrorJSON writes either.
func (s *Session) Write(p []byte) (n int64, err error) {
	defer func() {
		if r := recover(); r != nil {
			s.Cancel()
			n, err = 0, internal("reading the file", r)
		}
	}()
	if !s.active {
		if s.cancelled {
			return 0, &stats.Error{Code: stats.CodeCancelled, Msg: "reading cancelled: nothing was analysed"}
		}
		return 0, &stats.Error{Code: stats.CodeNoFile, Msg: "no file is being read: call begin first"}
	}
	if err := s.rd.Write(p); err != nil {
		s.Cancel()
		return 0, err
	}
	s.read += int64(len(p))
	return s.read, nil
}

// End finishes reading and keeps the table for Analyze. It returns JSON:
// {"name","bytes","fingerprint","columns","summary"} or an error object.
// digest is the file's SHA-256 as 64 lowercase hex digits when the caller
// has computed it (the page does, with the browser's Web Crypto, on another
// thread while the engine parses), or "" for the session to compute it
// (chunkReader.fingerprint says when a given digest is used).
func (s *Session) End(digest string) (out []byte) {
	defer func() {
		if r := recover(); r != nil {
			s.Cancel()
			s.Forget()
			out = ErrorJSON(internal("finishing the file", r))
		}
	}()
	if !s.active {
		if s.cancelled {
			return ErrorJSON(&stats.Error{Code: stats.CodeCancelled, Msg: "reading cancelled: nothing was analysed"})
		}
		return ErrorJSON(&stats.Error{Code: stats.CodeNoFile, Msg: "no file is being read"})
	}
	tab, err := s.rd.Finish()
	fp := s.rd.fingerprint(digest)
	name, n, rd := s.name, s.read, s.rd
	s.active, s.rd = false, nil
	if err != nil {
		s.Forget()
		return ErrorJSON(fmt.Errorf("%s: %w", name, err))
	}
	s.tab, s.fp, s.raw, s.rawOver, s.srcName = tab, fp, "", rd.over, name
	if !rd.over && len(rd.raw) > 0 {
		// The chunk reader's buffer is never written again: viewing it as a
		// string saves a copy of up to 64 MB in the worker's memory, which
		// WebAssembly never gives back.
		s.raw = unsafe.String(&rd.raw[0], len(rd.raw))
	}
	cols := make([]ingest.ColumnInfo, 0, len(tab.Columns))
	for _, c := range tab.Columns {
		cols = append(cols, c.ColumnInfo)
	}
	return mustJSON(map[string]any{"name": name, "bytes": n, "fingerprint": fp, "columns": cols, "summary": tab.Summary()})
}

// Cancel abandons a read in progress and returns the JSON error object the
// page shows for it (code "cancelled"). The last complete table is dropped
// too only when a new read begins.
func (s *Session) Cancel() []byte {
	s.cancelled = s.active
	s.active, s.rd, s.read = false, nil, 0
	return ErrorJSON(&stats.Error{Code: stats.CodeCancelled, Msg: "reading cancelled: nothing was analysed"})
}

// HasTable reports whether a file's table is kept for re-analysis.
func (s *Session) HasTable() bool { return s.tab != nil }

// Forget drops the kept table and its bytes (the user pasted text instead,
// or closed the report): nothing of the data stays in the session.
func (s *Session) Forget() {
	s.tab, s.fp, s.raw, s.rawOver, s.srcName = nil, "", "", false, ""
}

// Analyze runs the request. With useTable it analyses the kept table (the
// request's Text and Cells are ignored); otherwise the request's own data.
// It returns the report as JSON (or an error object) and its charts as SVG
// text keyed by chart name (nil on error). The charts travel beside the JSON
// rather than inside it: JSON-escaping SVG costs time and size.
func (s *Session) Analyze(reqJSON []byte, useTable bool) (out []byte, svg map[string]string) {
	defer func() {
		if r := recover(); r != nil {
			out, svg = ErrorJSON(internal("analysing", r)), nil
		}
	}()
	req, err := stats.ParseRequest(reqJSON)
	if err != nil {
		return ErrorJSON(err), nil
	}
	var rep *stats.Report
	if useTable {
		if s.tab == nil {
			return ErrorJSON(&stats.Error{Code: stats.CodeNoFile, Msg: "no file is loaded: drop or pick the file again"}), nil
		}
		rep, err = s.engine(req, s.tab, s.fp)
	} else {
		rep, err = s.engine(req, nil, "")
	}
	if err != nil {
		return ErrorJSON(err), nil
	}
	return stats.ReportJSON(rep, nil), chart.All(rep)
}

// AnalyzeJSON is the automation entry point: request JSON in, report JSON
// (or an error object) out, without charts and without the kept table.
func (s *Session) AnalyzeJSON(reqJSON []byte) (out []byte) {
	defer func() {
		if r := recover(); r != nil {
			out = ErrorJSON(internal("analysing", r))
		}
	}()
	req, err := stats.ParseRequest(reqJSON)
	if err != nil {
		return ErrorJSON(err)
	}
	return stats.ReportJSON(s.engine(req, nil, ""))
}

func (s *Session) engine(req stats.Request, tab *ingest.Table, fp string) (*stats.Report, error) {
	if s.analyze != nil {
		return s.analyze(req, tab, fp)
	}
	if tab != nil {
		return stats.AnalyzeTable(tab, fp, req)
	}
	return stats.Analyze(req)
}

func mustJSON(v any) []byte {
	b, err := json.Marshal(v)
	if err != nil {
		return ErrorJSON(&stats.Error{Code: stats.CodeInternal, Msg: fmt.Sprintf("internal error encoding the result: %v", err)})
	}
	return b
}
