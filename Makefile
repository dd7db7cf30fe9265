# spanwright: build, test and demo targets. Everything runs with only Go installed;
# .ci/run installs the Debian reference tools some tests compare against.
GO ?= go
BIN := bin/spanwright

.PHONY: build build-proj test test-proj lint race soak demo golden bench bench-campus fuzz e2e clean

build:
	$(GO) build -o $(BIN) ./cmd/spanwright

# the binary that reads projected inputs: PROJ through cgo (needs a C compiler, pkg-config
# and Debian's libproj-dev); see README, "Projected coordinates".
build-proj:
	$(GO) build -tags proj -o $(BIN) ./cmd/spanwright

# vet and every test, including the fuzz seed corpora; then test-proj.
test:
	$(GO) vet ./...
	$(GO) test -count=1 ./...
	$(MAKE) --no-print-directory test-proj

# the tests of geo/... built with PROJ (-tags proj), when pkg-config finds PROJ; skipped
# with a note otherwise, and a failure under CI=true, which must run them.
test-proj:
	@if pkg-config --exists proj 2>/dev/null && [ "$$($(GO) env CGO_ENABLED)" = 1 ]; then \
		echo "$(GO) vet -tags proj ./geo/..." && $(GO) vet -tags proj ./geo/... && \
		echo "$(GO) test -count=1 -tags proj ./geo/..." && $(GO) test -count=1 -tags proj ./geo/...; \
	elif [ "$$CI" = true ]; then \
		echo "make test-proj: no PROJ found by pkg-config, or no cgo (C compiler); CI needs libproj-dev, pkg-config and gcc (.ci/run installs them)" >&2; exit 1; \
	else \
		echo "make test-proj: no PROJ found by pkg-config, or no cgo (apt-get install libproj-dev pkg-config gcc); skipping the -tags proj tests of geo/..." >&2; \
	fi

# staticcheck (honnef.co/go/tools), installed at a fixed version into Go's bin folder when
# missing; CI runs it before make test.
STATICCHECK_VERSION := v0.8.2
STATICCHECK := $(shell $(GO) env GOPATH)/bin/staticcheck
lint:
	test -x $(STATICCHECK) || $(GO) install honnef.co/go/tools/cmd/staticcheck@$(STATICCHECK_VERSION)
	$(STATICCHECK) ./...
	if pkg-config --exists proj 2>/dev/null && [ "$$($(GO) env CGO_ENABLED)" = 1 ]; then $(STATICCHECK) -tags proj ./geo/...; fi

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

# check and plan of the binary on generated campuses of 1,000 and 5,000 buildings that look
# like real ones (route/internal/campusgen/campusfiles), timed with GNU time for the peak
# memory; the files go to bench-out/. The same runs as Go benchmarks, one core:
#   go test -run '^$$' -bench Commands -benchmem -benchtime 1x -count 3 -cpu 1 ./cmd/spanwright/
bench-campus: build
	@for n in 1000 5000; do \
		$(GO) run ./route/internal/campusgen/campusfiles -buildings $$n -out bench-out/campus$$n || exit 1; \
		/usr/bin/time -o bench-out/time -f "check $$n buildings: %e s wall, %U s user, %M KiB peak" \
			./$(BIN) check bench-out/campus$$n/plan.yaml >/dev/null || exit 1; cat bench-out/time; \
		/usr/bin/time -o bench-out/time -f "plan $$n buildings: %e s wall, %U s user, %M KiB peak" \
			./$(BIN) plan --out bench-out/plan$$n bench-out/campus$$n/plan.yaml >/dev/null 2>bench-out/plan$$n.err; \
		st=$$?; cat bench-out/time; [ $$st -eq 0 ] || [ $$st -eq 3 ] || { cat bench-out/plan$$n.err; exit 1; }; \
	done

# the HTML reports in a real browser (not part of make test): installs Debian's chromium and
# poppler-utils (pdftotext, to read the printed pages back) when missing, renders the demo's
# and the starter's report.html and two sweeps' compare.html headless to PNG and PDF in
# testdata/e2e/out/, and fails on a blank, clipped or wrongly sized page.
e2e:
	test -x /usr/bin/chromium || (apt-get update && apt-get install -y chromium)
	command -v pdftotext >/dev/null || (apt-get update && apt-get install -y poppler-utils)
	$(GO) test -count=1 -tags e2e -v ./testdata/e2e/

# a minute of coverage-guided fuzzing of the GeoJSON reader, and one of the plan reader
fuzz:
	$(GO) test -run '^$$' -fuzz FuzzParse -fuzztime 60s ./geo/
	$(GO) test -run '^$$' -fuzz FuzzParsePlan -fuzztime 60s ./route/plan/

clean:
	rm -rf bin demo-out bench-out
