package bridge

import "lotlens/stats/ingest"

// chunkReader turns a file's chunks into a table through the reader's
// chunked API (ingest.Stream): the file is never held whole in memory, but
// its decoded text is kept up to ShareTextMax for the share link.
type chunkReader struct{ s *ingest.Stream }

func newChunkReader(size int64) *chunkReader {
	return &chunkReader{s: ingest.NewStream(ingest.ReadOptions{SizeHint: size, KeepText: ShareTextMax})}
}

func (r *chunkReader) Write(p []byte) error {
	_, err := r.s.Write(p)
	return err
}

func (r *chunkReader) Finish() (*ingest.Table, error) { return r.s.Finish() }
