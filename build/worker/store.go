//go:build js && wasm

package main

import (
	"net/http"
	"strconv"

	"github.com/syumai/workers/cloudflare"
	"github.com/syumai/workers/cloudflare/kv"

	"lotlens/build/web/stored"
)

// Binding is the Workers KV binding that turns the encrypted stored link
// on (wrangler.stored.jsonc declares it); without it the store's endpoints
// answer 404 like any missing file. Vars: LOTLENS_SHARE_PER_HOUR (stores
// and deletes per client per hour, default 20) and, for the local test
// only, LOTLENS_SHARE_TEST=1 (expiry in seconds).
const Binding = "LOTLENS_SHARES"

// kvStore adapts Workers KV (github.com/syumai/workers/cloudflare/kv).
type kvStore struct{ ns *kv.Namespace }

func (k kvStore) Get(key string) (string, bool, error) {
	v, err := k.ns.GetString(key, nil)
	if err != nil {
		return "", false, err
	}
	// A missing key is JavaScript null, which syscall/js prints as "<null>";
	// every value stored here is JSON or digits.
	if v == "<null>" || v == "" {
		return "", false, nil
	}
	return v, true, nil
}

func (k kvStore) Put(key, value string, ttl int) error {
	return k.ns.PutString(key, value, &kv.PutOptions{ExpirationTTL: max(ttl, 60)})
}

func (k kvStore) Delete(key string) error { return k.ns.Delete(key) }

func env(r *http.Request) (stored.KV, stored.Config) {
	ns, err := kv.NewNamespace(Binding)
	if err != nil {
		return nil, stored.Config{}
	}
	cfg := stored.Defaults
	if n, err := strconv.Atoi(cloudflare.Getenv("LOTLENS_SHARE_PER_HOUR")); err == nil && n > 0 {
		cfg.StoresPerHour = n
	}
	cfg.TestSeconds = cloudflare.Getenv("LOTLENS_SHARE_TEST") == "1"
	return kvStore{ns}, cfg
}
