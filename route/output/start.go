package output

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/route/routing"
)

// RoutesFile is the name of the routes file in a plan's output folder: what ReadStart reads.
const RoutesFile = "routes.geojson"

// ErrStart is matched by every problem of a routes file read as a warm start (ReadStart).
var ErrStart = errors.New("invalid start routes")

// spansOf lists the span IDs of a line's steps, in its order (routes.geojson's "spans").
func spansOf(steps []geo.Step) []string {
	out := make([]string, len(steps))
	for i, st := range steps {
		out[i] = st.SpanID
	}
	return out
}

// ReadStart reads the routes of an earlier plan's output folder (its routes.geojson: each
// feasible leg's link, leg, medium and spans) as a warm start for `plan --start-from`; From
// is the folder's name. Files larger than maxBytes (0: input.DefaultDataMiB MiB) are
// refused. Every problem of the file comes back at once (ParseStart).
func ReadStart(dir string, maxBytes int64) (*routing.Start, error) {
	path := filepath.Join(dir, RoutesFile)
	const want = "an earlier plan's output folder, which holds its " + RoutesFile
	if fi, err := os.Stat(dir); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("start routes: %s: no such folder; want %s", dir, want)
		}
		return nil, fmt.Errorf("start routes: %w", err)
	} else if !fi.IsDir() {
		return nil, fmt.Errorf("start routes: %s is a file, not a folder; want %s", dir, want)
	}
	if _, err := os.Stat(path); errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("start routes: folder %s has no %s; want %s", dir, RoutesFile, want)
	}
	data, err := input.ReadFile(path, input.Cap(maxBytes, input.DefaultDataMiB))
	if err != nil {
		return nil, fmt.Errorf("start routes: %w", err)
	}
	st, err := ParseStart(path, data)
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		abs = dir
	}
	st.From = filepath.Base(abs)
	return st, nil
}

// ParseStart reads a routes file's bytes as a warm start (see ReadStart); name is the file's
// path, for messages. Each feature must have the properties link and leg ("primary" or
// "diverse"), text, medium, text, and spans, a list of span IDs (empty for a leg that takes
// no span); a link's leg given twice is a problem. Other properties and the geometry are not
// read. Problems are *input.Problem matching ErrStart, all of them in one *input.Problems.
func ParseStart(name string, data []byte) (*routing.Start, error) {
	var errs input.Problems
	fail := func(index int, item, key string, err error) {
		p := &input.Problem{File: name, Item: item, Key: key, Err: err, Class: ErrStart}
		if index >= 0 {
			p.Feature = &input.Feature{Index: index}
		}
		errs.Add(p)
	}
	var fc struct {
		Type     string            `json:"type"`
		Problem  json.RawMessage   `json:"problem_sha256"`
		Features []json.RawMessage `json:"features"`
	}
	if err := json.Unmarshal(data, &fc); err != nil || fc.Type != "FeatureCollection" {
		fail(-1, "", "", input.Errorf(input.ErrWrongType, "want the routes.geojson of a spanwright plan folder (a GeoJSON FeatureCollection)"))
		return nil, errs.Err()
	}
	props := make([]map[string]json.RawMessage, len(fc.Features))
	noSpans := 0
	for i, raw := range fc.Features {
		var f struct {
			Properties map[string]json.RawMessage `json:"properties"`
		}
		if json.Unmarshal(raw, &f) == nil {
			props[i] = f.Properties
		}
		if _, has := props[i]["spans"]; props[i] != nil && !has {
			noSpans++
		}
	}
	if noSpans > 1 && noSpans == len(fc.Features) {
		fail(-1, "", "", input.Errorf(input.ErrMissingKey, "no feature has the property \"spans\" (the leg's span IDs): a routes.geojson written by an older spanwright; plan it again"))
		return nil, errs.Err()
	}
	st := &routing.Start{}
	if fc.Problem != nil && (json.Unmarshal(fc.Problem, &st.ProblemSHA256) != nil || !isSHA256(st.ProblemSHA256)) {
		fail(-1, "", "problem_sha256", input.Errorf(input.ErrWrongType, "want the routing problem's SHA-256 as 64 hexadecimal digits, got %s", fc.Problem))
		st.ProblemSHA256 = ""
	}
	seen := map[[2]string]int{}
	for i := range fc.Features {
		pr := props[i]
		if pr == nil {
			fail(i, "", "properties", input.Errorf(input.ErrWrongType, "want a feature with properties"))
			continue
		}
		var l routing.StartLeg
		ok := true
		text := func(key string, dst *string) {
			v, has := pr[key]
			switch {
			case !has:
				fail(i, "", key, input.Errorf(input.ErrMissingKey, "missing; want the leg's %s", key))
				ok = false
			case json.Unmarshal(v, dst) != nil || *dst == "":
				fail(i, "", key, input.Errorf(input.ErrWrongType, "want the leg's %s as text, got %s", key, v))
				ok = false
			}
		}
		text("link", &l.Link)
		text("leg", &l.Leg)
		text("medium", &l.Medium)
		if ok && l.Leg != routing.LegPrimary && l.Leg != routing.LegDiverse {
			fail(i, "", "leg", input.Errorf(input.ErrBadValue, "want %q or %q, got %q", routing.LegPrimary, routing.LegDiverse, l.Leg))
			ok = false
		}
		if v, has := pr["spans"]; !has {
			fail(i, "", "spans", input.Errorf(input.ErrMissingKey, "missing; want the leg's span IDs (a routes.geojson written by an older spanwright has none: plan it again)"))
			ok = false
		} else if json.Unmarshal(v, &l.Spans) != nil || l.Spans == nil || hasEmpty(l.Spans) {
			fail(i, "", "spans", input.Errorf(input.ErrWrongType, "want a list of span IDs, got %s", v))
			ok = false
		}
		if !ok {
			continue
		}
		k := [2]string{l.Link, l.Leg}
		if first, dup := seen[k]; dup {
			fail(i, fmt.Sprintf("link %q", l.Link), "leg", input.Errorf(input.ErrBadValue, "the %s leg given twice: feature #%d has it", l.Leg, first))
			continue
		}
		seen[k] = i
		st.Legs = append(st.Legs, l)
	}
	if err := errs.Err(); err != nil {
		return nil, err
	}
	return st, nil
}

func hasEmpty(xs []string) bool {
	for _, x := range xs {
		if x == "" {
			return true
		}
	}
	return false
}

// isSHA256 reports whether s is a SHA-256 in lower-case hexadecimal, as routes.geojson's
// problem_sha256 is written.
func isSHA256(s string) bool {
	if len(s) != 64 {
		return false
	}
	for _, c := range s {
		if (c < '0' || c > '9') && (c < 'a' || c > 'f') {
			return false
		}
	}
	return true
}
