package dist

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// bundleSite has the shapes the page's modules use: named imports from a
// sibling and a subfolder, a module imported twice, two modules with a
// top-level name in common, a cycle (a function called only after both
// modules ran), a module-level value changed through an exported
// function, and a quoted worker script that is not a module.
func bundleSite() files {
	return files{
		"index.html": []byte(`<script type="module" src="app.js"></script>`),
		"app.js": []byte(`import { twice, bump, seen } from "./a.js";
import { label } from './sub/b.js';
const w = "engine.js";
bump(); bump();
console.log(label("x"), twice(21), seen(), w);
`),
		"a.js": []byte(`import { label } from "./sub/b.js";
let count = 0;
export function twice(n) { return label(String(n * 2)); }
export function bump() { count++; }
export function seen() { return count; }
`),
		"sub/b.js": []byte(`import { seen } from "../a.js";
let count = 100;
export function label(s) { count++; return "<" + s + ">"; }
export function both() { return seen() + count; }
`),
		"engine.js": []byte(`importScripts("wasm_exec.js");`),
	}
}

func TestBundleModules(t *testing.T) {
	site := bundleSite()
	if err := bundleModules(site, "app.js"); err != nil {
		t.Fatal(err)
	}
	for _, gone := range []string{"a.js", "sub/b.js"} {
		if _, ok := site[gone]; ok {
			t.Errorf("%s is still in the site after bundling", gone)
		}
	}
	for _, kept := range []string{"index.html", "engine.js", "app.js"} {
		if _, ok := site[kept]; !ok {
			t.Errorf("%s is missing after bundling", kept)
		}
	}
	out := string(site["app.js"])
	if regexp.MustCompile(`(?m)^\s*(import|export)\b`).MatchString(out) {
		t.Errorf("the bundle still imports or exports:\n%s", out)
	}
	// dependency order: b's body, then a's, then the entry's
	ib, ia, iapp := strings.Index(out, `"<" + s + ">"`), strings.Index(out, "n * 2"), strings.Index(out, "bump();")
	if ib < 0 || ia < 0 || iapp < 0 || !(ib < ia && ia < iapp) {
		t.Errorf("modules out of order (b at %d, a at %d, app at %d):\n%s", ib, ia, iapp, out)
	}
	if !strings.Contains(out, `"engine.js"`) {
		t.Errorf("the worker script's name was lost:\n%s", out)
	}
	// Run it where Node is installed (test-worker installs it; CI has it).
	node, err := exec.LookPath("node")
	if err != nil {
		t.Log("node not found: the bundle's output was checked by its text only")
		return
	}
	f := filepath.Join(t.TempDir(), "bundle.mjs")
	if err := os.WriteFile(f, []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := exec.Command(node, f).CombinedOutput()
	if err != nil {
		t.Fatalf("node ran the bundle: %v\n%s", err, got)
	}
	if want := "<x> <42> 2 engine.js\n"; string(got) != want {
		t.Errorf("the bundle printed %q, want %q", got, want)
	}
}

func TestBundleModulesRefuses(t *testing.T) {
	for _, c := range []struct{ name, app, want string }{
		{"package", `import { x } from "left-pad"; x();`, `only relative imports`},
		{"missing", `import { x } from "./nowhere.js"; x();`, `"./nowhere.js" is not a module of the site`},
		{"not a script", `import { x } from "./style.css"; x();`, `"./style.css" is not a module of the site`},
		{"no such export", `import { nothing } from "./a.js"; nothing();`, `No matching export`},
		{"not a module", `import { nothing } from "./engine.js"; nothing();`, `Import "nothing" will always be undefined`},
	} {
		site := bundleSite()
		site["app.js"] = []byte(c.app)
		site["style.css"] = []byte(`body{}`)
		err := bundleModules(site, "app.js")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one saying %q", c.name, err, c.want)
		}
		if string(site["app.js"]) != c.app {
			t.Errorf("%s: a failed bundle changed app.js", c.name)
		}
	}
}

// A site without the entry is left alone (the help-only builds of tests).
func TestBundleModulesNoEntry(t *testing.T) {
	site := files{"index.html": []byte(`<p>x</p>`), "a.js": []byte(`export const a = 1;`)}
	if err := bundleModules(site, "app.js"); err != nil || len(site) != 2 {
		t.Fatalf("err %v, site %v", err, site.names())
	}
}
