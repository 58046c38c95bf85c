package bridge

import (
	"encoding/hex"
	"hash"

	"lotlens/stats/digest"
	"lotlens/stats/ingest"
)

// chunkReader turns a file's chunks into a table through the reader's
// chunked API (ingest.Stream), and keeps the file's bytes exactly as they
// arrived, up to max (ShareBytesMax), for a share payload: the receiver then
// reads the very bytes the sender's engine read, so the table, every figure
// and the fingerprint (SHA-256 of those bytes) are the sender's.
//
// The fingerprint of kept bytes is taken once at the end, and only when the
// caller has not computed it already (fingerprint): the page hashes the file
// with the browser's Web Crypto on another thread while the engine parses,
// because Go's SHA-256 compiled to WebAssembly was about a third of the time
// the engine took to read a 6 MB file. Bytes that are not kept (a file
// larger than max) are hashed as they arrive.
type chunkReader struct {
	s    *ingest.Stream
	raw  []byte
	max  int
	over bool      // the file is larger than max: nothing is kept
	h    hash.Hash // SHA-256 of the bytes so far, once over
}

func newChunkReader(size int64, max int) *chunkReader {
	r := &chunkReader{s: ingest.NewStream(ingest.ReadOptions{SizeHint: size}), max: max}
	if size > int64(max) {
		r.over, r.h = true, digest.New()
	} else if size > 0 {
		r.raw = make([]byte, 0, size)
	}
	return r
}

func (r *chunkReader) Write(p []byte) error {
	if !r.over && len(r.raw)+len(p) > r.max {
		r.over, r.h = true, digest.New()
		r.h.Write(r.raw)
		r.raw = nil
	}
	if r.over {
		r.h.Write(p)
	} else {
		r.raw = append(r.raw, p...)
	}
	_, err := r.s.Write(p)
	return err
}

func (r *chunkReader) Finish() (*ingest.Table, error) { return r.s.Finish() }

// fingerprint is the SHA-256 of every byte written, as lowercase hex. A
// digest the caller computed (given) is taken as it is when the bytes were
// kept and it has the form of one (64 lowercase hex digits); otherwise the
// reader computes it (a malformed digest is the page's mistake, not the
// user's, so it costs time, never the file).
func (r *chunkReader) fingerprint(given string) string {
	if r.over {
		return hex.EncodeToString(r.h.Sum(nil))
	}
	if isSHA256Hex(given) {
		return given
	}
	sum := digest.Sum256(r.raw)
	return hex.EncodeToString(sum[:])
}

func isSHA256Hex(s string) bool {
	if len(s) != 2*digest.Size {
		return false
	}
	for i := 0; i < len(s); i++ {
		if c := s[i]; (c < '0' || c > '9') && (c < 'a' || c > 'f') {
			return false
		}
	}
	return true
}
