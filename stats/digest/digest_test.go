package digest

import (
	"crypto/sha256"
	"encoding/hex"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"
)

// Known answers: the three SHA-256 examples NIST publishes for FIPS 180-4
// (CSRC "Examples with intermediate values"; the digests from memory, and
// checked here against crypto/sha256 of Go 1.26 as well), and the empty
// message.
func TestKnownAnswers(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"", "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"},
		{"abc", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"},
		{"abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1"},
		{strings.Repeat("a", 1000000), "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0"},
	} {
		got := Sum256([]byte(c.in))
		ref := sha256.Sum256([]byte(c.in))
		if hex.EncodeToString(got[:]) != c.want || got != ref {
			t.Errorf("SHA-256 of %d bytes %.10q: %x, want %s (crypto/sha256: %x)", len(c.in), c.in, got, c.want, ref)
		}
	}
}

// Every length from 0 to 300 bytes (each padding case, one and two final
// blocks) and a few large ones, whole and written in random pieces, with a
// Sum taken midway (it must not disturb what follows), against crypto/sha256.
func TestSum256LikeCrypto(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	lengths := []int{1 << 16, 1<<16 + 1, 1000003, 3 << 20}
	for n := 0; n <= 300; n++ {
		lengths = append(lengths, n)
	}
	for _, n := range lengths {
		p := make([]byte, n)
		for i := range p {
			p[i] = byte(r.Uint32())
		}
		want := sha256.Sum256(p)
		if got := Sum256(p); got != want {
			t.Fatalf("Sum256 of %d bytes: %x, want %x", n, got, want)
		}
		if got := SumString(string(p)); got != want {
			t.Fatalf("SumString of %d bytes: %x, want %x", n, got, want)
		}
		d, ref := New(), sha256.New()
		for q := p; len(q) > 0; {
			k := min(len(q), r.IntN(200))
			if r.IntN(2) == 0 {
				d.Write(q[:k])
			} else {
				d.WriteString(string(q[:k]))
			}
			ref.Write(q[:k])
			q = q[k:]
			if r.IntN(50) == 0 {
				if got, want := d.Sum(nil), ref.Sum(nil); string(got) != string(want) {
					t.Fatalf("%d bytes: a sum midway %x, want %x", n, got, want)
				}
			}
		}
		if got := d.Sum([]byte("x")); string(got[1:]) != string(want[:]) || got[0] != 'x' {
			t.Fatalf("%d bytes in pieces: %x, want x%x", n, got, want)
		}
		d.Reset()
		d.Write(p)
		if got := d.Sum(nil); string(got) != string(want[:]) {
			t.Fatalf("%d bytes after Reset: %x, want %x", n, got, want)
		}
	}
	if d := New(); d.Size() != sha256.Size || d.BlockSize() != sha256.BlockSize {
		t.Errorf("Size %d, BlockSize %d", d.Size(), d.BlockSize())
	}
}

// The constants as FIPS 180-4 defines them (4.2.2, 5.3.3): the first 32
// bits of the fractional parts of the cube roots of the first 64 primes
// and of the square roots of the first 8, computed exactly with integers.
func TestConstantsFromPrimes(t *testing.T) {
	var primes []int64
	for n := int64(2); len(primes) < 64; n++ {
		prime := true
		for _, p := range primes {
			if n%p == 0 {
				prime = false
				break
			}
		}
		if prime {
			primes = append(primes, n)
		}
	}
	mask := big.NewInt(1<<32 - 1)
	for i, p := range primes {
		// floor(cbrt(p) * 2^32) = floor(cbrt(p * 2^96)), its low 32 bits
		want := new(big.Int).And(icbrt(new(big.Int).Lsh(big.NewInt(p), 96)), mask).Uint64()
		if uint64(k[i]) != want {
			t.Errorf("k[%d] = %#08x, want %#08x (prime %d)", i, k[i], want, p)
		}
		if i < 8 {
			want := new(big.Int).And(new(big.Int).Sqrt(new(big.Int).Lsh(big.NewInt(p), 64)), mask).Uint64()
			if uint64(iv[i]) != want {
				t.Errorf("iv[%d] = %#08x, want %#08x (prime %d)", i, iv[i], want, p)
			}
		}
	}
}

// icbrt is the integer cube root: the largest x with x^3 <= n (Newton's
// method from above).
func icbrt(n *big.Int) *big.Int {
	x := new(big.Int).Lsh(big.NewInt(1), uint(n.BitLen()/3+1))
	three, two := big.NewInt(3), big.NewInt(2)
	for {
		// y = (2x + n / x^2) / 3
		y := new(big.Int).Quo(n, new(big.Int).Mul(x, x))
		y.Add(y, new(big.Int).Mul(two, x))
		y.Quo(y, three)
		if y.Cmp(x) >= 0 {
			return x
		}
		x = y
	}
}

// go test -bench . ./stats/digest/ (natively, or as js/wasm in Node with
// GOOS=js GOARCH=wasm and go_js_wasm_exec on PATH): against crypto/sha256 in
// the same run.
var sink [Size]byte

func BenchmarkSum256(b *testing.B) {
	p := make([]byte, 1<<20)
	b.SetBytes(int64(len(p)))
	for b.Loop() {
		sink = Sum256(p)
	}
}

func BenchmarkCryptoSHA256(b *testing.B) {
	p := make([]byte, 1<<20)
	b.SetBytes(int64(len(p)))
	for b.Loop() {
		sink = sha256.Sum256(p)
	}
}
