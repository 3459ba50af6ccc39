# Kneepoint: every target installs what it needs when it is missing.
# See README.md for the two commands that matter: `make serve`, `make test`.

SHELL := /bin/bash
export PATH := $(HOME)/.cargo/bin:$(CURDIR)/node_modules/.bin:$(PATH)
export CARGO_TERM_COLOR := never
CARGO ?= cargo

.PHONY: setup-web setup-browser build dist serve test test-native lint \
        wasm-engine app e2e screenshots bench bench-web reference clean

setup-web:
	@scripts/setup.sh web

setup-browser:
	@scripts/setup.sh web browser

## Build the static site into dist/ (self-contained, any static server).
build dist: setup-web
	@echo "build: trunk build --release --offline"
	@trunk build --release --offline --dist dist

## Build and serve the app with the demo design on http://127.0.0.1:8080.
serve: setup-web
	@echo "serve: http://127.0.0.1:8080 (Ctrl-C to stop)"
	@trunk serve --release --offline --address 127.0.0.1 --port 8080

lint:
	@echo "test: cargo fmt --check"
	@$(CARGO) fmt --all --check
	@echo "test: cargo clippy -D warnings"
	@$(CARGO) clippy -q --workspace --all-targets -- -D warnings

test-native:
	@echo "test: cargo test (native)"
	@$(CARGO) test -q --workspace 2>&1 | tail -n +1

wasm-engine: setup-web
	@echo "test: engine builds for wasm32"
	@$(CARGO) build -q -p kneepoint-engine --target wasm32-unknown-unknown --release

app: build

## Every test: formatting, lints, native tests, wasm build, app, browser tests.
test: lint reference test-native wasm-engine app e2e
	@echo "test: all passed"

bench: reference
	@echo "bench: criterion, full steady-state evaluation"
	@$(CARGO) bench -p kneepoint-engine --bench evaluate -- --noplot
	@echo "bench: criterion, full duty cycle (ratio against the SciPy reference)"
	@$(CARGO) bench -p kneepoint-engine --bench cycle -- --noplot

## Browser tests (playwright-core on Debian chromium) against dist/.
e2e: build setup-browser
	@scripts/e2e.sh

## Screenshots at 1024x768, 768x1024 and 390x844 into docs/screenshots/.
screenshots: build setup-browser
	@scripts/e2e.sh screenshots

bench-web: build setup-browser
	@scripts/e2e.sh bench

## Independent SciPy reference for the duty-cycle integrator.
reference:
	@scripts/reference.sh

clean:
	@$(CARGO) clean
	@rm -rf dist
