// Package stored is the edge worker's store of encrypted shared analyses
// (off unless the deployment binds a KV namespace). The page encrypts a
// share payload with AES-256-GCM before sending it; this store only ever
// sees the ciphertext: it keeps it for the days the sender picked (1 to
// 30), with a size cap and a per-client rate limit, and gives it back by
// its id. The key stays in the link's fragment (never sent to a server) or
// is derived from a passphrase in the receiver's browser.
//
// Endpoints (all with the site's security headers and Cache-Control:
// no-store; no body is ever logged):
//
//	GET    /api/share             {"maxBytes","minDays","maxDays"}: the store is on
//	POST   /api/share?days=N      body: the encrypted blob (application/octet-stream)
//	                              -> 201 {"id","deleteToken","expires","size"}
//	GET    /api/share/<id>        -> 200 the blob, or 404 (unknown, expired, deleted)
//	DELETE /api/share/<id>        Authorization: Bearer <deleteToken> -> 204, 403 or 404
//	GET    /s/<id>                -> 303 to /?s=<id> (the browser keeps the #key)
//
// Without a store (no binding) every one of these falls through to the
// site's handler, which answers 404.
//
// It imports only the standard library and build/web, and tests natively
// against a map (KV is the interface the worker fills with Workers KV).
package stored

import (
	"crypto/rand"
	"crypto/sha256"
	"crypto/subtle"
	"encoding/base64"
	"encoding/hex"
	"encoding/json"
	"io"
	"net/http"
	"regexp"
	"strconv"
	"strings"
	"time"

	"lotlens/build/web"
)

// KV is the key-value store: Workers KV in the edge worker.
type KV interface {
	// Get returns the value, or ok false when the key does not exist.
	Get(key string) (value string, ok bool, err error)
	// Put stores the value for ttl seconds (at least 60, the platform's minimum).
	Put(key, value string, ttl int) error
	Delete(key string) error
}

// Config are the store's limits.
type Config struct {
	MaxBytes      int // largest blob accepted (bytes)
	MaxDays       int // longest expiry a sender may pick (days); the shortest is 1
	StoresPerHour int // stores and deletes per client per hour
	// TestSeconds lets a store request ask for an expiry in seconds
	// (?seconds=N): for the local test of expiry only, never in a deployment.
	TestSeconds bool
	Now         func() time.Time
}

// Defaults: 10 MB, 30 days, 20 stores per client per hour.
var Defaults = Config{MaxBytes: 10_000_000, MaxDays: 30, StoresPerHour: 20}

// ID is the form of a stored copy's id: 16 random bytes, base64url.
var ID = regexp.MustCompile(`^[A-Za-z0-9_-]{22}$`)

// record is what the store keeps for one copy.
type record struct {
	Expires int64  `json:"exp"`  // unix seconds
	Delete  string `json:"del"`  // hex SHA-256 of the delete token
	Size    int    `json:"size"` // bytes of the blob
	Data    string `json:"data"` // the encrypted blob, base64
}

// Handler serves the endpoints with the KV and limits that env returns for
// the request (a nil KV: the store is off, and next answers).
func Handler(env func(*http.Request) (KV, Config), next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		p := r.URL.Path
		if p != "/api/share" && !strings.HasPrefix(p, "/api/share/") && !strings.HasPrefix(p, "/s/") {
			next.ServeHTTP(w, r)
			return
		}
		store, cfg := env(r)
		if store == nil {
			next.ServeHTTP(w, r)
			return
		}
		if cfg.Now == nil {
			cfg.Now = time.Now
		}
		h := w.Header()
		for k, v := range web.Headers {
			h.Set(k, v)
		}
		h.Set("Cache-Control", "no-store")
		s := &server{kv: store, cfg: cfg}
		switch {
		case strings.HasPrefix(p, "/s/"):
			id := strings.TrimPrefix(p, "/s/")
			if (r.Method != http.MethodGet && r.Method != http.MethodHead) || !ID.MatchString(id) {
				next.ServeHTTP(w, r)
				return
			}
			h.Set("Location", "/?s="+id)
			w.WriteHeader(http.StatusSeeOther)
		case p == "/api/share":
			switch r.Method {
			case http.MethodGet:
				s.json(w, http.StatusOK, map[string]any{"maxBytes": cfg.MaxBytes, "minDays": 1, "maxDays": cfg.MaxDays})
			case http.MethodPost:
				s.store(w, r)
			default:
				s.fail(w, http.StatusMethodNotAllowed, "use GET or POST")
			}
		default:
			id := strings.TrimPrefix(p, "/api/share/")
			if !ID.MatchString(id) {
				s.fail(w, http.StatusNotFound, "no such stored copy")
				return
			}
			switch r.Method {
			case http.MethodGet:
				s.fetch(w, id)
			case http.MethodDelete:
				s.remove(w, r, id)
			default:
				s.fail(w, http.StatusMethodNotAllowed, "use GET or DELETE")
			}
		}
	})
}

type server struct {
	kv  KV
	cfg Config
}

func (s *server) json(w http.ResponseWriter, status int, v any) {
	b, _ := json.Marshal(v)
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(status)
	w.Write(b)
}

func (s *server) fail(w http.ResponseWriter, status int, msg string) {
	s.json(w, status, map[string]string{"error": msg})
}

// client is who a request counts against: the platform's client address
// header, else the connection's address; only its hash is stored.
func client(r *http.Request) string {
	a := r.Header.Get("CF-Connecting-IP")
	if a == "" {
		a = r.RemoteAddr
		if i := strings.LastIndexByte(a, ':'); i > 0 {
			a = a[:i]
		}
	}
	h := sha256.Sum256([]byte("lotlens-rate:" + a))
	return hex.EncodeToString(h[:12])
}

// limited counts one store or delete of the client and reports whether the
// client is over its hourly limit. (KV is eventually consistent: the limit
// is approximate, which is enough against abuse.)
func (s *server) limited(r *http.Request) (bool, error) {
	now := s.cfg.Now().Unix()
	key := "r:" + client(r) + ":" + strconv.FormatInt(now/3600, 10)
	v, ok, err := s.kv.Get(key)
	if err != nil {
		return false, err
	}
	n := 0
	if ok {
		n, _ = strconv.Atoi(v)
	}
	if n >= s.cfg.StoresPerHour {
		return true, nil
	}
	return false, s.kv.Put(key, strconv.Itoa(n+1), 3600+60)
}

func token(n int) string {
	b := make([]byte, n)
	rand.Read(b)
	return base64.RawURLEncoding.EncodeToString(b)
}

func (s *server) store(w http.ResponseWriter, r *http.Request) {
	if ct := r.Header.Get("Content-Type"); ct != "application/octet-stream" {
		s.fail(w, http.StatusUnsupportedMediaType, "send the encrypted copy as application/octet-stream")
		return
	}
	ttl := 0
	q := r.URL.Query()
	if sec := q.Get("seconds"); sec != "" && s.cfg.TestSeconds {
		n, err := strconv.Atoi(sec)
		if err != nil || n < 1 || n > 3600 {
			s.fail(w, http.StatusBadRequest, "seconds: 1 to 3600")
			return
		}
		ttl = n
	} else {
		days, err := strconv.Atoi(q.Get("days"))
		if err != nil || days < 1 || days > s.cfg.MaxDays || strconv.Itoa(days) != q.Get("days") {
			s.fail(w, http.StatusBadRequest, "days: a whole number from 1 to "+strconv.Itoa(s.cfg.MaxDays))
			return
		}
		ttl = days * 86400
	}
	// The body is read up to the cap before answering (answering first made
	// the local runtime reset the connection, which the page would show as
	// "offline"); the page checks the size before it sends.
	body, err := io.ReadAll(io.LimitReader(r.Body, int64(s.cfg.MaxBytes)+1))
	if err != nil {
		s.fail(w, http.StatusBadRequest, "the body could not be read")
		return
	}
	if len(body) > s.cfg.MaxBytes {
		s.fail(w, http.StatusRequestEntityTooLarge, "the encrypted copy is larger than "+strconv.Itoa(s.cfg.MaxBytes)+" bytes")
		return
	}
	// The envelope's first two bytes (format 1, mode 1 or 2) and the least
	// an IV and a GCM tag take: the store cannot check more, by design.
	if len(body) < 2+12+16 || body[0] != 1 || (body[1] != 1 && body[1] != 2) {
		s.fail(w, http.StatusBadRequest, "this is not an encrypted copy made by the Lotlens page")
		return
	}
	if over, err := s.limited(r); err != nil {
		s.fail(w, http.StatusServiceUnavailable, "the store is not available; try again later")
		return
	} else if over {
		w.Header().Set("Retry-After", "3600")
		s.fail(w, http.StatusTooManyRequests, "too many stored copies from this client; try again in an hour")
		return
	}
	id, del := token(16), token(32)
	sum := sha256.Sum256([]byte(del))
	exp := s.cfg.Now().Unix() + int64(ttl)
	rec, _ := json.Marshal(record{Expires: exp, Delete: hex.EncodeToString(sum[:]), Size: len(body), Data: base64.StdEncoding.EncodeToString(body)})
	if err := s.kv.Put("s:"+id, string(rec), max(ttl, 60)); err != nil {
		s.fail(w, http.StatusServiceUnavailable, "the store is not available; try again later")
		return
	}
	s.json(w, http.StatusCreated, map[string]any{"id": id, "deleteToken": del, "expires": exp, "size": len(body)})
}

func (s *server) get(id string) (*record, error) {
	v, ok, err := s.kv.Get("s:" + id)
	if err != nil || !ok {
		return nil, err
	}
	var rec record
	if json.Unmarshal([]byte(v), &rec) != nil {
		return nil, nil
	}
	if s.cfg.Now().Unix() >= rec.Expires {
		s.kv.Delete("s:" + id)
		return nil, nil
	}
	return &rec, nil
}

func (s *server) fetch(w http.ResponseWriter, id string) {
	rec, err := s.get(id)
	if err != nil {
		s.fail(w, http.StatusServiceUnavailable, "the store is not available; try again later")
		return
	}
	if rec == nil {
		s.fail(w, http.StatusNotFound, "no such stored copy: it expired or was deleted")
		return
	}
	b, err := base64.StdEncoding.DecodeString(rec.Data)
	if err != nil {
		s.fail(w, http.StatusNotFound, "no such stored copy")
		return
	}
	w.Header().Set("Content-Type", "application/octet-stream")
	w.Header().Set("Content-Length", strconv.Itoa(len(b)))
	w.WriteHeader(http.StatusOK)
	w.Write(b)
}

func (s *server) remove(w http.ResponseWriter, r *http.Request, id string) {
	tok, ok := strings.CutPrefix(r.Header.Get("Authorization"), "Bearer ")
	if !ok || tok == "" {
		s.fail(w, http.StatusForbidden, "give the delete token")
		return
	}
	if over, err := s.limited(r); err == nil && over {
		w.Header().Set("Retry-After", "3600")
		s.fail(w, http.StatusTooManyRequests, "too many requests from this client; try again in an hour")
		return
	}
	rec, err := s.get(id)
	if err != nil {
		s.fail(w, http.StatusServiceUnavailable, "the store is not available; try again later")
		return
	}
	if rec == nil {
		s.fail(w, http.StatusNotFound, "no such stored copy: it expired or was deleted")
		return
	}
	sum := sha256.Sum256([]byte(tok))
	if subtle.ConstantTimeCompare([]byte(hex.EncodeToString(sum[:])), []byte(rec.Delete)) != 1 {
		s.fail(w, http.StatusForbidden, "the delete token does not match")
		return
	}
	if err := s.kv.Delete("s:" + id); err != nil {
		s.fail(w, http.StatusServiceUnavailable, "the store is not available; try again later")
		return
	}
	w.WriteHeader(http.StatusNoContent)
}
