//go:build js && wasm

// Command wasm is the only package that imports syscall/js. It binds the
// engine's calls to JavaScript names inside the page's Web Worker
// (site/engine.js); the logic is in package bridge, which tests natively.
// Errors are JSON objects {"error": "...", "code": "..."}; a Go panic in the
// engine is caught by the bridge and comes back as one (code "internal").
//
//	lotlensAnalyze(requestJSON) -> reportJSON          the automation entry point
//	lotlensRun(requestJSON, useTable) -> {json, svg}   report JSON + charts as SVG text
//	lotlensBegin(name, size)                           start reading a file
//	lotlensChunk(uint8Array) -> bytes so far | errorJSON  feed the next chunk
//	lotlensEnd(digest?) -> JSON                        finish: fingerprint, columns; digest: the
//	                                                   file's SHA-256 in hex if the page computed it
//	lotlensCancel() -> errorJSON (code "cancelled")    abandon the read
//	lotlensForget()                                    drop the kept table and bytes
//	lotlensShare(shareJSON, form) -> {json, bytes?}    a share payload: form "link" (json has
//	                                                   the link text), "file" or "bytes" (Uint8Array)
//	lotlensOpen(data, form) -> {json, shared?, svg?}   open a payload: data is the link text
//	                                                   (string) or a Uint8Array ("file", "bytes")
package main

import (
	"syscall/js"

	"lotlens/wasm/bridge"
)

func main() {
	var s bridge.Session
	var buf []byte
	g := js.Global()
	str := func(args []js.Value, i int) (string, bool) {
		if len(args) <= i || args[i].Type() != js.TypeString {
			return "", false
		}
		return args[i].String(), true
	}
	g.Set("lotlensAnalyze", js.FuncOf(func(this js.Value, args []js.Value) any {
		req, ok := str(args, 0)
		if !ok {
			return `{"error":"lotlensAnalyze takes one argument: the request as a JSON string","code":"bad-request"}`
		}
		return string(s.AnalyzeJSON([]byte(req)))
	}))
	g.Set("lotlensRun", js.FuncOf(func(this js.Value, args []js.Value) any {
		req, ok := str(args, 0)
		if !ok {
			return map[string]any{"json": `{"error":"lotlensRun takes the request as a JSON string","code":"bad-request"}`}
		}
		useTable := len(args) > 1 && args[1].Truthy()
		j, svg := s.Analyze([]byte(req), useTable)
		charts := map[string]any{}
		for k, v := range svg {
			charts[k] = v
		}
		return map[string]any{"json": string(j), "svg": charts}
	}))
	g.Set("lotlensBegin", js.FuncOf(func(this js.Value, args []js.Value) any {
		name, _ := str(args, 0)
		size := int64(0)
		if len(args) > 1 && args[1].Type() == js.TypeNumber {
			size = int64(args[1].Float())
		}
		s.Begin(name, size)
		return nil
	}))
	g.Set("lotlensChunk", js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) != 1 || args[0].Type() != js.TypeObject {
			return `{"error":"lotlensChunk takes one Uint8Array","code":"bad-request"}`
		}
		n := args[0].Get("length").Int()
		if cap(buf) < n {
			buf = make([]byte, n)
		}
		buf = buf[:n]
		js.CopyBytesToGo(buf, args[0])
		read, err := s.Write(buf)
		if err != nil {
			return string(bridge.ErrorJSON(err))
		}
		return float64(read)
	}))
	g.Set("lotlensEnd", js.FuncOf(func(this js.Value, args []js.Value) any {
		digest, _ := str(args, 0)
		return string(s.End(digest))
	}))
	g.Set("lotlensCancel", js.FuncOf(func(this js.Value, args []js.Value) any {
		return string(s.Cancel())
	}))
	g.Set("lotlensForget", js.FuncOf(func(this js.Value, args []js.Value) any {
		s.Forget()
		return nil
	}))
	g.Set("lotlensShare", js.FuncOf(func(this js.Value, args []js.Value) any {
		in, ok1 := str(args, 0)
		form, ok2 := str(args, 1)
		if !ok1 || !ok2 {
			return map[string]any{"json": `{"error":"lotlensShare takes the share request as a JSON string and the form","code":"bad-request"}`}
		}
		j, bin := s.Share([]byte(in), form)
		out := map[string]any{"json": string(j)}
		if bin != nil {
			u := js.Global().Get("Uint8Array").New(len(bin))
			js.CopyBytesToJS(u, bin)
			out["bytes"] = u
		}
		return out
	}))
	g.Set("lotlensOpen", js.FuncOf(func(this js.Value, args []js.Value) any {
		form, ok := str(args, 1)
		if len(args) < 2 || !ok {
			return map[string]any{"json": `{"error":"lotlensOpen takes the payload and its form","code":"bad-request"}`}
		}
		var in []byte
		switch args[0].Type() {
		case js.TypeString:
			in = []byte(args[0].String())
		case js.TypeObject:
			in = make([]byte, args[0].Get("length").Int())
			js.CopyBytesToGo(in, args[0])
		default:
			return map[string]any{"json": `{"error":"lotlensOpen takes a string or a Uint8Array","code":"bad-request"}`}
		}
		rep, meta, svg := s.Open(in, form)
		charts := map[string]any{}
		for k, v := range svg {
			charts[k] = v
		}
		out := map[string]any{"json": string(rep), "svg": charts}
		if meta != nil {
			out["shared"] = string(meta)
		}
		return out
	}))
	g.Call("postMessage", map[string]any{"type": "ready"})
	select {}
}
