# rollerbed: two set-up commands on a fresh Debian machine with Go and gcc:
#   make demo   installs what is missing, builds, runs the built-in demo case
#   make test   the full test suite (what CI runs)

GO          ?= go
BIN         := bin/rollerbed
DEMO_DIR    ?= demo-run
STATICCHECK := honnef.co/go/tools/cmd/staticcheck@v0.8.2

.PHONY: all deps test-deps build demo test lint bench verify-full clean

all: build

# What building and running need: FFTW and HDF5 (and the reader tools the
# tests use). A cluster user with FFTW and HDF5 present needs only go build.
deps:
	@./scripts/install-deps.sh

# What the tests need besides: a one-node Slurm cluster for the sweep tests
# and headless Chromium for the browser tests of the live page and
# report.html (they skip, saying so, where it cannot be installed).
test-deps: deps
	@./scripts/install-slurm.sh
	@./scripts/install-chromium.sh

build: deps
	$(GO) build -buildvcs=auto -o $(BIN) ./cmd/rollerbed

demo: build
	./$(BIN) run --out $(DEMO_DIR) --force
	@echo "demo: the run folder is $(DEMO_DIR)/"

test: test-deps lint
	$(GO) test -timeout 20m ./...

lint: deps
	@out=$$(gofmt -l $$(git ls-files '*.go' 2>/dev/null || find . -name '*.go')); \
	  if [ -n "$$out" ]; then echo "gofmt would change:"; echo "$$out"; exit 1; fi
	$(GO) vet ./...
	$(GO) run $(STATICCHECK) ./...

bench: deps
	$(GO) test -run '^$$' -bench . -benchmem ./solver/...

# Fuller verification sizes; slow (tens of minutes), not part of make test.
verify-full: build
	./$(BIN) verify --full

clean:
	rm -rf bin $(DEMO_DIR)
