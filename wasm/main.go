//go:build js && wasm

// Command wasm is the only package that imports syscall/js. It is a thin JSON
// bridge: the page's Web Worker calls lotlensAnalyze(requestJSON) and gets the
// report JSON back. No logic lives here.
package main

import (
	"syscall/js"

	"lotlens/stats"
)

func main() {
	js.Global().Set("lotlensAnalyze", js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) != 1 || args[0].Type() != js.TypeString {
			return `{"error":"lotlensAnalyze takes one argument: the request as a JSON string"}`
		}
		return string(stats.AnalyzeJSON([]byte(args[0].String())))
	}))
	js.Global().Call("postMessage", map[string]any{"type": "ready"})
	select {}
}
