# spanwright: build, test and demo targets. Everything runs with only Go installed;
# .ci/run installs the Debian reference tools some tests compare against.
GO ?= go
BIN := bin/spanwright

.PHONY: build test lint race soak demo golden bench fuzz e2e clean

build:
	$(GO) build -o $(BIN) ./cmd/spanwright

# vet and every test, including the fuzz seed corpora.
test:
	$(GO) vet ./...
	$(GO) test -count=1 ./...

# staticcheck (honnef.co/go/tools), installed at a fixed version into Go's bin folder when
# missing; CI runs it before make test.
STATICCHECK_VERSION := v0.8.2
STATICCHECK := $(shell $(GO) env GOPATH)/bin/staticcheck
lint:
	test -x $(STATICCHECK) || $(GO) install honnef.co/go/tools/cmd/staticcheck@$(STATICCHECK_VERSION)
	$(STATICCHECK) ./...

# the tests under the race detector (needs cgo and a C compiler; not part of make test): the
# sweep's worker pool and the caches shared by its scenarios are the concurrent parts.
race:
	$(GO) test -race -count=1 ./...

# the optimizer against CBC on 24 generated campuses of 100-300 buildings (route/optimize,
# TestQualityAgainstCBC; hours: CBC takes minutes on the larger ones), then the metamorphic
# properties (route/metamorphic) on 300 generated campuses of 40 buildings and 20 of 300,
# instead of make test's 8 of 40 (not part of make test).
soak:
	SPANWRIGHT_SOAK_QUALITY=24 $(GO) test -count=1 -timeout 6h -run TestQualityAgainstCBC -v ./route/optimize/
	SPANWRIGHT_SOAK=300 $(GO) test -count=1 -timeout 2h ./route/metamorphic/
	SPANWRIGHT_SOAK=20 SPANWRIGHT_SOAK_BUILDINGS=300 $(GO) test -count=1 -timeout 2h ./route/metamorphic/

# plan the embedded demo campus into demo-out/
demo: build
	./$(BIN) demo --out demo-out

# rewrite golden files after an intended change; review the diff of *.golden.* files.
golden:
	$(GO) test ./cmd/... -update

# speed and memory figures (not run by make test)
bench:
	$(GO) test -run '^$$' -bench . -benchmem ./...

# the HTML reports in a real browser (not part of make test): installs Debian's chromium
# when it is missing, renders the demo's report.html and a sweep's compare.html headless to
# PNG and PDF in testdata/e2e/out/, and fails on a blank, clipped or wrongly sized page.
e2e:
	test -x /usr/bin/chromium || (apt-get update && apt-get install -y chromium)
	$(GO) test -count=1 -tags e2e -v ./testdata/e2e/

# a minute of coverage-guided fuzzing of the GeoJSON reader, and one of the plan reader
fuzz:
	$(GO) test -run '^$$' -fuzz FuzzParse -fuzztime 60s ./geo/
	$(GO) test -run '^$$' -fuzz FuzzParsePlan -fuzztime 60s ./route/plan/

clean:
	rm -rf bin demo-out
