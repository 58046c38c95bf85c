// Package storecheck is the HTTP check of the encrypted store (build/web/stored),
// run against the native handler (its test) and the edge worker under
// wrangler dev with its local KV (build/workertest). The client side does
// what the page does (site/stored.js): AES-256-GCM under a random key, the
// envelope of format 1, the key kept out of every request.
package storecheck

import (
	"bytes"
	"crypto/aes"
	"crypto/cipher"
	"crypto/rand"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"strings"
	"testing"
	"time"

	"lotlens/build/web"
)

// Seal encrypts plain as the page does with a key in the link (mode 1):
// 1, 1, IV (12), ciphertext and tag; the first two bytes are authenticated.
func Seal(key, plain []byte) []byte {
	blk, _ := aes.NewCipher(key)
	g, _ := cipher.NewGCM(blk)
	head := []byte{1, 1}
	iv := make([]byte, 12)
	rand.Read(iv)
	return append(append(head, iv...), g.Seal(nil, iv, plain, head)...)
}

// Open decrypts a blob of mode 1.
func Open(key, blob []byte) ([]byte, error) {
	if len(blob) < 30 || blob[0] != 1 || blob[1] != 1 {
		return nil, fmt.Errorf("not an envelope of mode 1")
	}
	blk, err := aes.NewCipher(key)
	if err != nil {
		return nil, err
	}
	g, _ := cipher.NewGCM(blk)
	return g.Open(nil, blob[2:14], blob[14:], blob[:2])
}

type stored struct {
	ID          string `json:"id"`
	DeleteToken string `json:"deleteToken"`
	Expires     int64  `json:"expires"`
	Size        int    `json:"size"`
}

// Run checks the store at base (e.g. http://127.0.0.1:8787): maxBytes and
// perHour are the limits it was started with, and it must accept ?seconds=.
// sent records every request's bytes as sent (address, headers, body) for
// the check that none carries the key or the plain data.
func Run(t *testing.T, base string, maxBytes, perHour int) {
	t.Helper()
	c := &http.Client{Timeout: 60 * time.Second, CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
	var sent [][]byte
	do := func(method, path, ctype string, body []byte, hdr map[string]string) (*http.Response, []byte) {
		t.Helper()
		req, _ := http.NewRequest(method, base+path, bytes.NewReader(body))
		if ctype != "" {
			req.Header.Set("Content-Type", ctype)
		}
		for k, v := range hdr {
			req.Header.Set(k, v)
		}
		sent = append(sent, append([]byte(method+" "+path+fmt.Sprint(req.Header)), body...))
		res, err := c.Do(req)
		if err != nil {
			t.Fatalf("%s %s: %v", method, path, err)
		}
		b, _ := io.ReadAll(res.Body)
		res.Body.Close()
		if res.Header.Get("Cache-Control") != "no-store" {
			t.Errorf("%s %s: Cache-Control %q", method, path, res.Header.Get("Cache-Control"))
		}
		for k, v := range web.Headers {
			if res.Header.Get(k) != v {
				t.Errorf("%s %s: %s is %q", method, path, k, res.Header.Get(k))
			}
		}
		return res, b
	}
	// The page's config.
	res, b := do("GET", "/api/share", "", nil, nil)
	var cfg struct{ MaxBytes, MinDays, MaxDays int }
	if res.StatusCode != 200 || json.Unmarshal(b, &cfg) != nil || cfg.MaxBytes != maxBytes || cfg.MinDays != 1 || cfg.MaxDays != 30 {
		t.Fatalf("config: %d %s", res.StatusCode, b)
	}
	plain := []byte("Lotl-plain-payload: 5.02 4.98 5.07 (invented)")
	key := make([]byte, 32)
	rand.Read(key)
	blob := Seal(key, plain)
	// Store, fetch, decrypt.
	res, b = do("POST", "/api/share?days=7", "application/octet-stream", blob, nil)
	var st stored
	if res.StatusCode != 201 || json.Unmarshal(b, &st) != nil || st.Size != len(blob) || st.DeleteToken == "" ||
		st.Expires < time.Now().Unix()+7*86400-600 || st.Expires > time.Now().Unix()+7*86400+600 {
		t.Fatalf("store: %d %s", res.StatusCode, b)
	}
	res, b = do("GET", "/api/share/"+st.ID, "", nil, nil)
	if res.StatusCode != 200 || !bytes.Equal(b, blob) || res.Header.Get("Content-Type") != "application/octet-stream" {
		t.Fatalf("fetch: %d, %d bytes", res.StatusCode, len(b))
	}
	if got, err := Open(key, b); err != nil || !bytes.Equal(got, plain) {
		t.Errorf("decrypt: %v", err)
	}
	// A wrong key does not open it (AES-GCM's tag).
	wrong := append([]byte(nil), key...)
	wrong[0] ^= 1
	if _, err := Open(wrong, b); err == nil {
		t.Error("a wrong key opened the copy")
	}
	// The short link redirects to the page, keeping the id.
	res, _ = do("GET", "/s/"+st.ID, "", nil, nil)
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/?s="+st.ID {
		t.Errorf("/s/<id>: %d %q", res.StatusCode, res.Header.Get("Location"))
	}
	// Delete: a wrong token is refused, the right one deletes.
	res, _ = do("DELETE", "/api/share/"+st.ID, "", nil, map[string]string{"Authorization": "Bearer x" + st.DeleteToken})
	if res.StatusCode != http.StatusForbidden {
		t.Errorf("delete with a wrong token: %d", res.StatusCode)
	}
	res, _ = do("DELETE", "/api/share/"+st.ID, "", nil, map[string]string{"Authorization": "Bearer " + st.DeleteToken})
	if res.StatusCode != http.StatusNoContent {
		t.Errorf("delete: %d", res.StatusCode)
	}
	if res, _ = do("GET", "/api/share/"+st.ID, "", nil, nil); res.StatusCode != 404 {
		t.Errorf("fetch after delete: %d", res.StatusCode)
	}
	// Expired.
	res, b = do("POST", "/api/share?seconds=1", "application/octet-stream", blob, nil)
	var ex stored
	if res.StatusCode != 201 || json.Unmarshal(b, &ex) != nil {
		t.Fatalf("store for 1 s: %d %s", res.StatusCode, b)
	}
	time.Sleep(2100 * time.Millisecond)
	if res, _ = do("GET", "/api/share/"+ex.ID, "", nil, nil); res.StatusCode != 404 {
		t.Errorf("fetch after expiry: %d", res.StatusCode)
	}
	// Strict input: oversized, wrong type, days, not an envelope, bad ids.
	for _, c := range []struct {
		name, method, path, ctype string
		body                      []byte
		status                    int
	}{
		{"oversized", "POST", "/api/share?days=1", "application/octet-stream", append(blob, make([]byte, maxBytes)...), 413},
		{"form post", "POST", "/api/share?days=1", "application/x-www-form-urlencoded", blob, 415},
		{"json", "POST", "/api/share?days=1", "application/json", blob, 415},
		{"0 days", "POST", "/api/share?days=0", "application/octet-stream", blob, 400},
		{"31 days", "POST", "/api/share?days=31", "application/octet-stream", blob, 400},
		{"no days", "POST", "/api/share", "application/octet-stream", blob, 400},
		{"not an envelope", "POST", "/api/share?days=1", "application/octet-stream", []byte("5.02\n4.98\n5.07\n5.01\n5.00\n4.97\n5.03\n"), 400},
		{"bad id", "GET", "/api/share/..%2F..%2Fetc", "", nil, 404},
		{"short id", "GET", "/api/share/abc", "", nil, 404},
		{"unknown id", "GET", "/api/share/AAAAAAAAAAAAAAAAAAAAAA", "", nil, 404},
		{"put", "PUT", "/api/share", "application/octet-stream", blob, 405},
	} {
		if res, b := do(c.method, c.path, c.ctype, c.body, nil); res.StatusCode != c.status {
			t.Errorf("%s: status %d, want %d (%s)", c.name, res.StatusCode, c.status, b)
		}
	}
	// A bad id after /s/ is the site's own 404 page.
	if res, err := c.Get(base + "/s/not-an-id"); err != nil || res.StatusCode != 404 {
		t.Errorf("/s/ with a bad id: %v %v", res, err)
	} else {
		res.Body.Close()
	}
	// Rate limited: this client has stored twice and deleted twice this hour
	// (deletes count too).
	limited := false
	for i := 4; i < perHour+2 && !limited; i++ {
		res, _ := do("POST", "/api/share?days=1", "application/octet-stream", blob, nil)
		switch res.StatusCode {
		case 201:
		case 429:
			limited = true
			if i < perHour {
				t.Errorf("rate limited after %d stores, the limit is %d", i, perHour)
			}
		default:
			t.Fatalf("store %d: status %d", i, res.StatusCode)
		}
	}
	if !limited {
		t.Errorf("no 429 after %d stores in an hour", perHour+1)
	}
	// No request carried the key or the plain data.
	for _, r := range sent {
		for _, sec := range [][]byte{key, plain, []byte(fmt.Sprintf("%x", key))} {
			if bytes.Contains(r, sec) {
				t.Errorf("a request carries the key or the plain data: %.80q", r)
			}
		}
		if strings.Contains(string(r), "5.02 4.98") {
			t.Errorf("a request carries a reading: %.80q", r)
		}
	}
}
