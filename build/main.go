// Command build makes and serves the site.
//
//	go run ./build dist [-out dist]              compile the wasm and write the site into dist/
//	go run ./build serve [-dir dist] [-port N]   serve dist/ on 127.0.0.1 with the worker's headers
//	go run ./build worker [-dir dist] [-assets]  prepare the edge worker in build/worker from dist/
package main

import (
	"flag"
	"fmt"
	"net/http"
	"os"

	"lotlens/build/dist"
)

func main() {
	if len(os.Args) < 2 {
		fmt.Fprintln(os.Stderr, "usage: go run ./build dist|serve|worker [flags]")
		os.Exit(2)
	}
	fs := flag.NewFlagSet(os.Args[1], flag.ExitOnError)
	out := fs.String("out", "dist", "output directory")
	dir := fs.String("dir", "dist", "directory to serve")
	port := fs.String("port", envOr("PORT", "8080"), "port to serve on")
	assets := fs.Bool("assets", false, "worker: serve the site from the static-asset binding instead of embedding it")
	fs.Parse(os.Args[2:])
	switch os.Args[1] {
	case "dist":
		if err := dist.Build(".", *out); err != nil {
			fmt.Fprintln(os.Stderr, "build:", err)
			os.Exit(1)
		}
		fmt.Println("wrote", *out)
	case "worker":
		if err := buildWorker(*dir, *assets); err != nil {
			fmt.Fprintln(os.Stderr, "worker:", err)
			os.Exit(1)
		}
	case "serve":
		addr := "127.0.0.1:" + *port
		fmt.Printf("Lotlens is at http://%s/ (Ctrl-C stops it)\n", addr)
		if err := http.ListenAndServe(addr, dist.Handler(*dir)); err != nil {
			fmt.Fprintln(os.Stderr, "serve:", err)
			os.Exit(1)
		}
	default:
		fmt.Fprintf(os.Stderr, "unknown command %q: use dist, serve or worker\n", os.Args[1])
		os.Exit(2)
	}
}

func envOr(k, def string) string {
	if v := os.Getenv(k); v != "" {
		return v
	}
	return def
}
