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
# Node tools (wrangler) live in build/node: package.json, its lock file, node_modules.
WRANGLER := build/node/node_modules/.bin/wrangler

.PHONY: run dist test test-go test-wasm test-browser test-worker test-worker-assets vet deps-browser deps-node bench bench-page fuzz deploy deploy-stored clean

run: dist ## build dist/ and serve it on http://127.0.0.1:$(PORT)
	$(GO) run ./build serve -dir dist -port $(PORT)

dist: ## compile the wasm and write the site into dist/
	$(GO) run ./build dist -out dist

test: vet test-go test-wasm test-browser test-worker ## everything CI runs
	@echo "make test: all passed"

vet:
	@unformatted=$$(gofmt -l $$(find build site stats wasm -name '*.go' -not -path 'build/node/*')); \
	  if [ -n "$$unformatted" ]; then echo "gofmt needed: $$unformatted"; exit 1; fi
	$(GO) vet ./...
	GOOS=js GOARCH=wasm $(GO) vet ./wasm ./stats/...

test-go: ## native unit tests (browser tests run in test-browser)
	$(GO) test -short ./...

test-wasm: ## the engine's tests again as js/wasm (-short: the long property runs are native only), in Node through go_js_wasm_exec
	PATH="$(WASMPATH)" GOOS=js GOARCH=wasm $(GO) test -short ./stats/...

test-browser: deps-browser dist ## the page in headless Chromium
	$(GO) test -count=1 ./site/

deps-browser: ## Chromium, and pdftotext (poppler-utils) for the print test, from Debian's packages
	@if ! [ -x "$(CHROMIUM)" ] || ! command -v pdftotext >/dev/null; then \
	  if [ "$$(id -u)" = 0 ] && command -v apt-get >/dev/null; then \
	    echo "installing Chromium and poppler-utils from Debian's packages"; \
	    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium poppler-utils >/dev/null; \
	  else \
	    echo "Chromium and pdftotext are needed for the browser tests: run  sudo apt-get install chromium poppler-utils  (or set CHROMIUM=/path/to/chromium)"; exit 1; \
	  fi; \
	fi

test-worker: deps-node deps-browser dist ## the edge worker under workerd (wrangler dev) checked over HTTP, the stored link in headless Chromium against it; the reproducible-build and local-server tests
	$(GO) run ./build worker -dir dist
	LOTLENS_WORKER_TEST=1 $(GO) test -count=1 ./build/...

test-worker-assets: deps-node dist ## the alternative worker (site in the static-asset binding), same checks
	$(GO) run ./build worker -dir dist -assets
	LOTLENS_WORKER_TEST=1 LOTLENS_WORKER_CONFIG=build/worker/wrangler.assets.jsonc $(GO) test -count=1 ./build/workertest/

deps-node: ## Node.js (Debian's packages, as root) and wrangler (pinned by build/node/package-lock.json, installed into build/node/node_modules by npm ci)
	@if ! command -v node >/dev/null || ! command -v npm >/dev/null; then \
	  if [ "$$(id -u)" = 0 ] && command -v apt-get >/dev/null; then \
	    echo "installing Node.js and npm from Debian's packages"; \
	    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq nodejs npm >/dev/null; \
	  else \
	    echo "Node.js 20 and npm are needed for the edge worker: run  sudo apt-get install nodejs npm"; exit 1; \
	  fi; \
	fi
	@major=$$(node -p 'process.versions.node.split(".")[0]'); if [ "$$major" -lt 20 ]; then \
	  echo "wrangler 4.86.0 needs Node.js 20 or later; this machine has $$(node --version). Install Node.js 20 (e.g. from NodeSource) and rerun."; exit 1; fi
	@if ! [ -x $(WRANGLER) ] || [ build/node/package-lock.json -nt build/node/node_modules/.package-lock.json ]; then \
	  npm ci --prefix build/node --no-audit --no-fund; fi

deploy: deps-node dist ## deploy the edge worker to your own Cloudflare account (README: Deployment)
	$(GO) run ./build worker -dir dist
	$(WRANGLER) deploy --config build/worker/wrangler.jsonc

deploy-stored: deps-node dist ## the same, with the encrypted stored link on (put your KV namespace id in build/worker/wrangler.stored.jsonc first)
	$(GO) run ./build worker -dir dist
	$(WRANGLER) deploy --config build/worker/wrangler.stored.jsonc

bench: ## engine and reader benchmarks
	$(GO) test -run '^$$' -bench . -benchmem ./stats/...

bench-page: deps-browser dist ## page speed in headless Chromium: cold load, 10k paste, 1M-value drop, wasm size
	$(GO) test -run '^$$' -bench . -benchtime 3x -timeout 30m ./site/

clean:
	rm -rf dist build/worker/dist build/worker/build
