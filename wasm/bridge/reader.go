package bridge

import "lotlens/stats/ingest"

// chunkReader turns a file's chunks into a table through the reader's
// chunked API (ingest.Stream), and keeps the file's bytes exactly as they
// arrived, up to ShareBytesMax, for a share payload: the receiver then reads
// the very bytes the sender's engine read, so the table, every figure and
// the fingerprint (SHA-256 of those bytes) are the sender's.
type chunkReader struct {
	s    *ingest.Stream
	raw  []byte
	over bool // the file is larger than ShareBytesMax: nothing is kept
}

func newChunkReader(size int64) *chunkReader {
	r := &chunkReader{s: ingest.NewStream(ingest.ReadOptions{SizeHint: size})}
	if size > ShareBytesMax {
		r.over = true
	} else if size > 0 {
		r.raw = make([]byte, 0, size)
	}
	return r
}

func (r *chunkReader) Write(p []byte) error {
	if !r.over {
		if len(r.raw)+len(p) > ShareBytesMax {
			r.raw, r.over = nil, true
		} else {
			r.raw = append(r.raw, p...)
		}
	}
	_, err := r.s.Write(p)
	return err
}

func (r *chunkReader) Finish() (*ingest.Table, error) { return r.s.Finish() }
