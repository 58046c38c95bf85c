package dist

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"path"
	"regexp"
	"sort"
	"strings"

	"lotlens/build/web"
)

// files is a site in memory: slash-separated path relative to the site root ->
// content. The build works on it and writes it out at the end.
type files map[string][]byte

func (fs files) names() []string {
	out := make([]string, 0, len(fs))
	for n := range fs {
		out = append(out, n)
	}
	sort.Strings(out)
	return out
}

// keepName reports whether a file keeps its name (is not fingerprinted): the
// entry pages, the service worker (its URL must stay stable), the 404 page and
// the help pages (short cache, linkable).
func keepName(name string) bool {
	switch name {
	case "index.html", "sw.js", "404.html", "robots.txt", "favicon.ico":
		return true
	}
	return strings.HasPrefix(name, "help/") && strings.HasSuffix(name, ".html")
}

// rewritable reports whether references inside a file are rewritten.
func rewritable(name string) bool {
	switch path.Ext(name) {
	case ".html", ".js", ".mjs", ".css", ".webmanifest":
		return true
	}
	return false
}

// quotedRef matches a quoted string that may name a site file; cssURL an
// unquoted CSS url(...).
var (
	quotedRef = regexp.MustCompile(`"([^"\s<>]+)"|'([^'\s<>]+)'`)
	cssURL    = regexp.MustCompile(`url\(\s*([^'"\s)][^)\s]*)\s*\)`)
)

// resolve turns a reference found in file `from` into a site path, or "" when
// it is not a site-relative reference (external, data:, fragment only...).
func resolve(from, ref string) (target, suffix string) {
	if ref == "" || strings.Contains(ref, "://") || strings.HasPrefix(ref, "//") || strings.HasPrefix(ref, "#") ||
		strings.HasPrefix(ref, "data:") || strings.HasPrefix(ref, "blob:") || strings.HasPrefix(ref, "mailto:") ||
		strings.HasPrefix(ref, "javascript:") {
		return "", ""
	}
	p := ref
	if i := strings.IndexAny(p, "?#"); i >= 0 {
		p, suffix = p[:i], p[i:]
	}
	if p == "" {
		return "", ""
	}
	if strings.HasPrefix(p, "/") {
		target = path.Clean(p)[1:]
	} else {
		target = path.Join(path.Dir(from), p)
	}
	if target == "" || target == "." {
		target = "index.html"
	} else if strings.HasSuffix(p, "/") || p == "." || p == ".." {
		target = path.Join(target, "index.html")
	}
	return target, suffix
}

// relRef is the reference to `to` written in the style of the original
// reference `orig` (same directory part, new base name).
func relRef(orig, to string) string {
	return orig[:strings.LastIndex(orig, "/")+1] + path.Base(to)
}

// fingerprint renames every asset that does not keep its name to
// name.<hash>.ext, where the hash covers the asset's content after its own
// references were rewritten, and rewrites the quoted references to them in
// .html, .js, .css and .webmanifest files. It returns the renaming.
func fingerprint(site files) (map[string]string, error) {
	renamed := map[string]string{}
	state := map[string]int{} // 0 new, 1 in progress, 2 done
	var visit func(name string, stack []string) error
	visit = func(name string, stack []string) error {
		switch state[name] {
		case 1:
			return fmt.Errorf("assets refer to each other in a cycle: %s", strings.Join(append(stack, name), " -> "))
		case 2:
			return nil
		}
		state[name] = 1
		if rewritable(name) {
			// Settle every referenced asset first, then rewrite.
			for _, ref := range refs(name, site[name]) {
				if t, _ := resolve(name, ref); t != "" && t != name {
					if _, ok := site[t]; ok && !keepName(t) {
						if err := visit(t, append(stack, name)); err != nil {
							return err
						}
					}
				}
			}
			site[name] = rewrite(name, site[name], renamed)
		}
		if !keepName(name) {
			sum := sha256.Sum256(site[name])
			ext := path.Ext(name)
			renamed[name] = strings.TrimSuffix(name, ext) + "." + hex.EncodeToString(sum[:])[:web.HashLen] + ext
		}
		state[name] = 2
		return nil
	}
	for _, n := range site.names() {
		if err := visit(n, nil); err != nil {
			return nil, err
		}
	}
	for old, neu := range renamed {
		site[neu] = site[old]
		delete(site, old)
	}
	return renamed, nil
}

// refs lists the candidate references in a text file.
func refs(name string, b []byte) []string {
	var out []string
	for _, m := range quotedRef.FindAllSubmatch(b, -1) {
		if len(m[1]) > 0 {
			out = append(out, string(m[1]))
		} else {
			out = append(out, string(m[2]))
		}
	}
	if path.Ext(name) == ".css" {
		for _, m := range cssURL.FindAllSubmatch(b, -1) {
			out = append(out, string(m[1]))
		}
	}
	return out
}

// rewrite replaces references to renamed files.
func rewrite(name string, b []byte, renamed map[string]string) []byte {
	swap := func(ref string) string {
		t, suffix := resolve(name, ref)
		if neu, ok := renamed[t]; ok {
			base := ref
			if suffix != "" {
				base = ref[:len(ref)-len(suffix)]
			}
			return relRef(base, neu) + suffix
		}
		return ref
	}
	b = quotedRef.ReplaceAllFunc(b, func(m []byte) []byte {
		q := m[0]
		inner := string(m[1 : len(m)-1])
		return []byte(string(q) + swap(inner) + string(q))
	})
	if path.Ext(name) == ".css" {
		b = cssURL.ReplaceAllFunc(b, func(m []byte) []byte {
			inner := strings.TrimSpace(string(m[4 : len(m)-1]))
			return []byte("url(" + swap(inner) + ")")
		})
	}
	return b
}

// Service-worker placeholders (the page's site/sw.js carries them).
const (
	buildIDPlaceholder = "__LOTLENS_BUILD__"
	assetsPlaceholder  = `["__LOTLENS_ASSETS__"]`
)

// fillServiceWorker substitutes the build id (a hash of every other file's
// name and content) and the list of every file as root-relative URLs.
func fillServiceWorker(site files) error {
	sw, ok := site["sw.js"]
	if !ok {
		return nil
	}
	h := sha256.New()
	var urls []string
	for _, n := range site.names() {
		if n == "sw.js" {
			continue
		}
		fmt.Fprintf(h, "%s\x00%d\x00", n, len(site[n]))
		h.Write(site[n])
		urls = append(urls, "/"+n)
	}
	id := hex.EncodeToString(h.Sum(nil))[:16]
	list, err := json.Marshal(urls)
	if err != nil {
		return err
	}
	s := strings.ReplaceAll(string(sw), buildIDPlaceholder, id)
	s = strings.ReplaceAll(s, assetsPlaceholder, string(list))
	site["sw.js"] = []byte(s)
	return nil
}
