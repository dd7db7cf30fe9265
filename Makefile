# spanwright: build, test and demo targets. Everything runs with only Go installed;
# .ci/run installs the Debian reference tools some tests compare against.
GO ?= go
BIN := bin/spanwright

.PHONY: build test demo golden bench fuzz clean

build:
	$(GO) build -o $(BIN) ./cmd/spanwright

# vet and every test, including the fuzz seed corpora.
test:
	$(GO) vet ./...
	$(GO) test -count=1 ./...

# plan the embedded demo campus into demo-out/
demo: build
	./$(BIN) demo --out demo-out

# rewrite golden files after an intended change; review the diff of *.golden.* files.
golden:
	$(GO) test ./cmd/... -update

# speed and memory figures (not run by make test)
bench:
	$(GO) test -run '^$$' -bench . -benchmem ./...

# a minute of coverage-guided fuzzing of the GeoJSON reader
fuzz:
	$(GO) test -run '^$$' -fuzz FuzzParse -fuzztime 60s ./geo/

clean:
	rm -rf bin demo-out
