package stored_test

import (
	"net/http"
	"net/http/httptest"
	"sync"
	"testing"
	"time"

	"lotlens/build/web/stored"
	"lotlens/build/web/stored/storecheck"
)

// mapKV is an in-memory KV with expiry.
type mapKV struct {
	mu sync.Mutex
	m  map[string]string
	t  map[string]time.Time
}

func (k *mapKV) Get(key string) (string, bool, error) {
	k.mu.Lock()
	defer k.mu.Unlock()
	if exp, ok := k.t[key]; ok && time.Now().After(exp) {
		delete(k.m, key)
	}
	v, ok := k.m[key]
	return v, ok, nil
}

func (k *mapKV) Put(key, value string, ttl int) error {
	k.mu.Lock()
	defer k.mu.Unlock()
	k.m[key], k.t[key] = value, time.Now().Add(time.Duration(ttl)*time.Second)
	return nil
}

func (k *mapKV) Delete(key string) error {
	k.mu.Lock()
	defer k.mu.Unlock()
	delete(k.m, key)
	return nil
}

func TestStore(t *testing.T) {
	kv := &mapKV{m: map[string]string{}, t: map[string]time.Time{}}
	cfg := stored.Config{MaxBytes: 4096, MaxDays: 30, StoresPerHour: 6, TestSeconds: true}
	site := http.NotFoundHandler()
	srv := httptest.NewServer(stored.Handler(func(*http.Request) (stored.KV, stored.Config) { return kv, cfg }, site))
	defer srv.Close()
	storecheck.Run(t, srv.URL, cfg.MaxBytes, cfg.StoresPerHour)
	for k, v := range kv.m {
		if len(k) > 2 && k[:2] == "s:" && len(v) > cfg.MaxBytes*2 {
			t.Errorf("record %s of %d bytes", k, len(v))
		}
	}
}

// TestStoreOff: without a KV every endpoint falls through to the site (404).
func TestStoreOff(t *testing.T) {
	srv := httptest.NewServer(stored.Handler(func(*http.Request) (stored.KV, stored.Config) { return nil, stored.Defaults }, http.NotFoundHandler()))
	defer srv.Close()
	for _, p := range []string{"/api/share", "/api/share/AAAAAAAAAAAAAAAAAAAAAA", "/s/AAAAAAAAAAAAAAAAAAAAAA"} {
		res, err := http.Get(srv.URL + p)
		if err != nil {
			t.Fatal(err)
		}
		res.Body.Close()
		if res.StatusCode != 404 {
			t.Errorf("%s: %d without a store", p, res.StatusCode)
		}
	}
}
