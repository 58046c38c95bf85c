package dist

import (
	"fmt"
	"path"
	"regexp"
	"sort"
	"strings"
)

var (
	htmlAttr = regexp.MustCompile(`(?is)<([a-z][a-z0-9]*)\b[^>]*?\s(href|src|poster|action)\s*=\s*("([^"]*)"|'([^']*)')`)
	htmlID   = regexp.MustCompile(`\sid\s*=\s*"([^"]*)"`)
	external = regexp.MustCompile(`(?i)^([a-z][a-z0-9+.-]*:)?//`)
)

// jsChecked are the extensions of quoted paths in scripts that must exist:
// the files a script loads.
var jsChecked = map[string]bool{".js": true, ".mjs": true, ".wasm": true, ".css": true, ".webmanifest": true}

// checkLinks checks every internal reference in the site: href/src in HTML
// (and the #fragment, against the target's ids), url() in CSS, the quoted
// paths scripts load. It refuses every external resource; the only external
// URLs allowed are plain outbound <a href> links in help pages.
func checkLinks(site files) error {
	ids := map[string]map[string]bool{}
	for _, n := range site.names() {
		if path.Ext(n) == ".html" {
			set := map[string]bool{}
			for _, m := range htmlID.FindAllSubmatch(site[n], -1) {
				set[string(m[1])] = true
			}
			ids[n] = set
		}
	}
	var bad []string
	add := func(file, format string, a ...any) { bad = append(bad, file+": "+fmt.Sprintf(format, a...)) }
	internal := func(file, ref string) {
		t, suffix := resolve(file, ref)
		if t == "" {
			if strings.HasPrefix(ref, "#") && len(ref) > 1 && path.Ext(file) == ".html" && !ids[file][ref[1:]] {
				add(file, "link %q: no element with that id on the page", ref)
			}
			return
		}
		if _, ok := site[t]; !ok {
			add(file, "link %q: %s is not in the site", ref, t)
			return
		}
		if frag, ok := strings.CutPrefix(suffix, "#"); ok && frag != "" && path.Ext(t) == ".html" && !ids[t][frag] {
			add(file, "link %q: %s has no element with id %q", ref, t, frag)
		}
	}
	for _, n := range site.names() {
		b := site[n]
		switch path.Ext(n) {
		case ".html":
			for _, m := range htmlAttr.FindAllSubmatch(b, -1) {
				tag, attr := strings.ToLower(string(m[1])), strings.ToLower(string(m[2]))
				ref := string(m[4]) + string(m[5])
				ref = strings.ReplaceAll(ref, "&amp;", "&")
				switch {
				case external.MatchString(ref):
					if !(tag == "a" && attr == "href" && strings.HasPrefix(n, "help/")) {
						add(n, "external resource <%s %s=%q>: the site must load nothing from other origins", tag, attr, ref)
					}
				case strings.HasPrefix(ref, "data:") && tag == "img":
				case strings.HasPrefix(strings.ToLower(ref), "javascript:"):
					add(n, "javascript: URL in <%s %s>", tag, attr)
				case strings.HasPrefix(ref, "mailto:") && tag == "a":
				default:
					internal(n, ref)
				}
			}
		case ".css":
			for _, m := range cssURL.FindAllSubmatch(b, -1) {
				checkCSSRef(n, string(m[1]), internal, add)
			}
			for _, m := range regexp.MustCompile(`url\(\s*["']([^"']*)["']\s*\)`).FindAllSubmatch(b, -1) {
				checkCSSRef(n, string(m[1]), internal, add)
			}
			if regexp.MustCompile(`@import\s+["']?(https?:)?//`).Match(b) {
				add(n, "external @import")
			}
		case ".js", ".mjs":
			for _, ref := range refs(n, b) {
				if external.MatchString(ref) {
					if regexp.MustCompile(`^(https?:)?//[^\s/]+/\S*\.(js|mjs|wasm|css)$`).MatchString(ref) {
						add(n, "script loads an external resource %q", ref)
					}
					continue
				}
				t, _ := resolve(n, ref)
				if t == "" || strings.ContainsAny(ref, "${}*") {
					continue
				}
				ext := path.Ext(strings.TrimSuffix(ref, "/"))
				if jsChecked[ext] || ((strings.HasPrefix(t, "demo/") || strings.HasPrefix(t, "help/")) && ext != "") {
					internal(n, ref)
				}
			}
		}
	}
	if len(bad) > 0 {
		sort.Strings(bad)
		return fmt.Errorf("link check: %d problem(s):\n  %s", len(bad), strings.Join(bad, "\n  "))
	}
	return nil
}

func checkCSSRef(file, ref string, internal func(string, string), add func(string, string, ...any)) {
	switch {
	case external.MatchString(ref):
		add(file, "external resource url(%s)", ref)
	case strings.HasPrefix(ref, "data:"), strings.HasPrefix(ref, "#"):
	default:
		internal(file, ref)
	}
}
