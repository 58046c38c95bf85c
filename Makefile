# Lotlens. `make run` serves the page; `make test` runs every test.
# Both set up what they need on a fresh Debian machine (see README.md).

SHELL := /bin/bash
.SHELLFLAGS := -euo pipefail -c
PORT ?= 8080
GO ?= go
GOROOT := $(shell $(GO) env GOROOT)
WASMPATH := $(PATH):$(GOROOT)/lib/wasm
CHROMIUM ?= /usr/bin/chromium
export CHROMIUM

.PHONY: run dist test test-go test-wasm test-browser test-worker vet deps-browser deps-node bench fuzz deploy clean

run: dist ## build dist/ and serve it on http://127.0.0.1:$(PORT)
	$(GO) run ./build serve -dir dist -port $(PORT)

dist: ## compile the wasm and write the site into dist/
	$(GO) run ./build dist -out dist

test: vet test-go test-wasm test-browser ## everything CI runs
	@echo "make test: all passed"

vet:
	@unformatted=$$(gofmt -l build site stats wasm); \
	  if [ -n "$$unformatted" ]; then echo "gofmt needed: $$unformatted"; exit 1; fi
	$(GO) vet ./...
	GOOS=js GOARCH=wasm $(GO) vet ./wasm ./stats/...

test-go: ## native unit tests (browser tests run in test-browser)
	$(GO) test -short ./...

test-wasm: ## the engine's tests again as js/wasm, in Node through go_js_wasm_exec
	PATH="$(WASMPATH)" GOOS=js GOARCH=wasm $(GO) test ./stats/...

test-browser: deps-browser dist ## the page in headless Chromium
	$(GO) test -count=1 ./site/

deps-browser:
	@if ! [ -x "$(CHROMIUM)" ]; then \
	  if [ "$$(id -u)" = 0 ] && command -v apt-get >/dev/null; then \
	    echo "installing Chromium from Debian's packages"; \
	    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null; \
	  else \
	    echo "Chromium is needed for the browser tests: run  sudo apt-get install chromium  (or set CHROMIUM=/path/to/chromium)"; exit 1; \
	  fi; \
	fi

bench: ## engine and reader benchmarks
	$(GO) test -run '^$$' -bench . -benchmem ./stats/...

clean:
	rm -rf dist
