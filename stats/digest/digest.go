// Package digest is SHA-256 (FIPS 180-4) for the engine's fingerprints of
// the data and the check sum of a share payload. It replaces crypto/sha256
// in the engine because that package brings Go's FIPS 140 module with it
// (its self-test registry, a DRBG with AES, SHA-3, SHA-512, HMAC, all set up
// at init): 239 KB of the 7.4 MB WebAssembly engine and 54 KB of its 1.54 MB
// brotli download, for one function of about a hundred lines. Nothing here
// is a secret or a signature: a fingerprint tells two copies of the same
// data apart from different data. TestSum256LikeCrypto holds it to
// crypto/sha256 byte for byte; TestEngineLeavesOut (wasm/bridge)
// keeps crypto/sha256 out of the engine. Speed, in Node's WebAssembly: 93
// MB/s against crypto/sha256's 105 (BenchmarkSum256 and BenchmarkCryptoSHA256,
// same run); the engine hashes pasted text (70 KB for 10,000 values) and
// files over 64 MiB, the page's Web Crypto every other file. Natively
// crypto/sha256 uses the CPU's SHA instructions and is 8 times faster, which
// the engine's native uses (tests, help pages) do not need.
package digest

import (
	"encoding/binary"
	"math/bits"
	"unsafe"
)

// Size is the length of a SHA-256 sum in bytes; BlockSize its block.
const (
	Size      = 32
	BlockSize = 64
)

// initial hash value (FIPS 180-4, 5.3.3): the first 32 bits of the
// fractional parts of the square roots of the first 8 primes; checked by
// TestConstantsFromPrimes
var iv = [8]uint32{
	0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a, 0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19,
}

// round constants (FIPS 180-4, 4.2.2): the first 32 bits of the fractional
// parts of the cube roots of the first 64 primes; checked by
// TestConstantsFromPrimes
var k = [64]uint32{
	0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
	0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
	0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
	0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
	0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
	0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
	0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
	0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2,
}

// Hash is a running SHA-256 (it implements hash.Hash). The zero value is
// not ready: use New.
type Hash struct {
	h    [8]uint32
	buf  [BlockSize]byte
	nbuf int
	n    uint64 // bytes written
}

// New returns a SHA-256 with nothing written yet.
func New() *Hash {
	d := new(Hash)
	d.Reset()
	return d
}

// Reset forgets everything written.
func (d *Hash) Reset() {
	d.h, d.nbuf, d.n = iv, 0, 0
}

// Size is 32; BlockSize 64.
func (d *Hash) Size() int      { return Size }
func (d *Hash) BlockSize() int { return BlockSize }

// Write adds p; it never fails.
func (d *Hash) Write(p []byte) (int, error) {
	n := len(p)
	d.n += uint64(n)
	if d.nbuf > 0 {
		c := copy(d.buf[d.nbuf:], p)
		d.nbuf += c
		p = p[c:]
		if d.nbuf < BlockSize {
			return n, nil
		}
		blocks(&d.h, d.buf[:])
		d.nbuf = 0
	}
	if m := len(p) &^ (BlockSize - 1); m > 0 {
		blocks(&d.h, p[:m])
		p = p[m:]
	}
	d.nbuf = copy(d.buf[:], p)
	return n, nil
}

// WriteString adds s without copying it first.
func (d *Hash) WriteString(s string) (int, error) {
	return d.Write(unsafe.Slice(unsafe.StringData(s), len(s))) // read only
}

// Sum appends the sum of what was written so far to b; more can be
// written after it.
func (d *Hash) Sum(b []byte) []byte {
	c := *d
	s := c.finish()
	return append(b, s[:]...)
}

// finish pads (FIPS 180-4, 5.1.1: a 1 bit, zeros, the length in bits as
// 64 bits) and returns the sum; d is spent.
func (d *Hash) finish() [Size]byte {
	var pad [BlockSize + 8]byte
	pad[0] = 0x80
	zeros := (BlockSize + 55 - d.n%BlockSize) % BlockSize // so the length ends a block
	binary.BigEndian.PutUint64(pad[1+zeros:], d.n<<3)
	d.Write(pad[:1+zeros+8])
	var out [Size]byte
	for i, v := range d.h {
		binary.BigEndian.PutUint32(out[4*i:], v)
	}
	return out
}

// Sum256 is the SHA-256 of p.
func Sum256(p []byte) [Size]byte {
	var d Hash
	d.Reset()
	d.Write(p)
	return d.finish()
}

// SumString is the SHA-256 of s, without copying s.
func SumString(s string) [Size]byte {
	var d Hash
	d.Reset()
	d.WriteString(s)
	return d.finish()
}

// blocks runs the compression function (FIPS 180-4, 6.2.2) over each
// 64-byte block of p (len(p) a multiple of 64).
func blocks(h *[8]uint32, p []byte) {
	var w [64]uint32
	h0, h1, h2, h3, h4, h5, h6, h7 := h[0], h[1], h[2], h[3], h[4], h[5], h[6], h[7]
	for ; len(p) >= BlockSize; p = p[BlockSize:] {
		for i := 0; i < 16; i++ {
			w[i] = binary.BigEndian.Uint32(p[4*i:])
		}
		for i := 16; i < 64; i++ {
			x, y := w[i-2], w[i-15]
			s1 := bits.RotateLeft32(x, -17) ^ bits.RotateLeft32(x, -19) ^ x>>10
			s0 := bits.RotateLeft32(y, -7) ^ bits.RotateLeft32(y, -18) ^ y>>3
			w[i] = s1 + w[i-7] + s0 + w[i-16]
		}
		a, b, c, d, e, f, g, hh := h0, h1, h2, h3, h4, h5, h6, h7
		for i := 0; i < 64; i++ {
			t1 := hh + (bits.RotateLeft32(e, -6) ^ bits.RotateLeft32(e, -11) ^ bits.RotateLeft32(e, -25)) +
				(e&f ^ ^e&g) + k[i] + w[i]
			t2 := (bits.RotateLeft32(a, -2) ^ bits.RotateLeft32(a, -13) ^ bits.RotateLeft32(a, -22)) +
				(a&b ^ a&c ^ b&c)
			hh, g, f, e, d, c, b, a = g, f, e, d+t1, c, b, a, t1+t2
		}
		h0 += a
		h1 += b
		h2 += c
		h3 += d
		h4 += e
		h5 += f
		h6 += g
		h7 += hh
	}
	h[0], h[1], h[2], h[3], h[4], h[5], h[6], h[7] = h0, h1, h2, h3, h4, h5, h6, h7
}
