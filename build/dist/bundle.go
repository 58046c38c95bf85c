package dist

import (
	"fmt"
	"path"
	"sort"
	"strings"
	"sync"

	"github.com/evanw/esbuild/pkg/api"
)

// bundleModules replaces the page's entry module and every module it
// imports, directly or not, with one module: the entry's name holding
// them all, in the order the browser would run them (esbuild, as a
// library; no syntax is lowered or minified). The browser then loads one
// script instead of a graph of about twenty fetched level by level: on a
// cold load the page's code ran about 100 ms earlier, and the engine was
// ready 30-70 ms sooner (DEVELOPERS.md, Start-up). The sources stay as
// they are in site/; a module a page or script names directly besides
// the entry would be left dangling, which checkLinks reports.
func bundleModules(site files, entry string) error {
	if _, ok := site[entry]; !ok {
		return nil
	}
	var mu sync.Mutex
	used := map[string]bool{}
	plugin := api.Plugin{
		Name: "site",
		Setup: func(b api.PluginBuild) {
			b.OnResolve(api.OnResolveOptions{Filter: ".*"}, func(a api.OnResolveArgs) (api.OnResolveResult, error) {
				var t string
				if a.Kind == api.ResolveEntryPoint {
					t = a.Path
				} else {
					if !strings.HasPrefix(a.Path, "./") && !strings.HasPrefix(a.Path, "../") {
						return api.OnResolveResult{}, fmt.Errorf("only relative imports of the site's own modules are bundled, not %q", a.Path)
					}
					t, _ = resolve(a.Importer, a.Path)
				}
				if _, ok := site[t]; !ok || path.Ext(t) != ".js" {
					return api.OnResolveResult{}, fmt.Errorf("%q is not a module of the site", a.Path)
				}
				return api.OnResolveResult{Path: t, Namespace: "site"}, nil
			})
			b.OnLoad(api.OnLoadOptions{Filter: ".*", Namespace: "site"}, func(a api.OnLoadArgs) (api.OnLoadResult, error) {
				mu.Lock()
				used[a.Path] = true
				mu.Unlock()
				s := string(site[a.Path])
				return api.OnLoadResult{Contents: &s, Loader: api.LoaderJS}, nil
			})
		},
	}
	res := api.Build(api.BuildOptions{
		EntryPoints:   []string{entry},
		Bundle:        true,
		Format:        api.FormatESModule,
		Platform:      api.PlatformBrowser,
		Target:        api.ESNext,
		Charset:       api.CharsetUTF8,
		LegalComments: api.LegalCommentsNone,
		LogLevel:      api.LogLevelSilent,
		Outfile:       entry,
		Write:         false,
		Plugins:       []api.Plugin{plugin},
	})
	// a warning (an import the module does not export, a duplicate key...)
	// is a mistake in the page's code: refused like an error
	if bad := append(res.Errors, res.Warnings...); len(bad) > 0 {
		var msgs []string
		for _, m := range bad {
			where := ""
			if m.Location != nil {
				where = fmt.Sprintf("%s:%d: ", m.Location.File, m.Location.Line)
			}
			msgs = append(msgs, where+m.Text)
		}
		sort.Strings(msgs)
		return fmt.Errorf("bundling %s: %s", entry, strings.Join(msgs, "; "))
	}
	if len(res.OutputFiles) != 1 {
		return fmt.Errorf("bundling %s: %d outputs, want 1", entry, len(res.OutputFiles))
	}
	for n := range used {
		delete(site, n)
	}
	site[entry] = res.OutputFiles[0].Contents
	return nil
}
