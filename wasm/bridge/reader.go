package bridge

import (
	"bytes"
	"unicode/utf8"

	"lotlens/stats/ingest"
)

// chunkReader turns a file's chunks into a table.
//
// Until the reader offers a chunked API, it gathers the bytes and reads them
// in one go at the end; the session's SHA-256 is computed chunk by chunk
// either way.
type chunkReader struct{ buf bytes.Buffer }

func newChunkReader() *chunkReader { return &chunkReader{} }

func (r *chunkReader) Write(p []byte) error {
	r.buf.Write(p)
	return nil
}

func (r *chunkReader) Finish() (*ingest.Table, error) {
	b := r.buf.Bytes()
	b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf"))
	if !utf8.Valid(b) {
		b = bytes.ToValidUTF8(b, []byte("\uFFFD"))
	}
	return ingest.Read(string(b))
}
