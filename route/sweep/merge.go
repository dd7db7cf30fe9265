package sweep

import (
	"context"
	"errors"
	"fmt"
	"net/url"
	"os"
	"path/filepath"
	"reflect"
	"strings"

	"spanwright/route/fileset"
	"spanwright/route/output"
)

// ErrMerge is wrapped by Merge's error when the rows files given do not make one whole sweep.
var ErrMerge = errors.New("merge")

// Merge joins the rows files found in dirs (each the output folder of one or more shards of a
// sweep, or of a whole sweep) into one comparison written to out: the same compare.csv,
// compare.xlsx, compare.md, rows.jsonl and more's files (when more is not nil), byte for
// byte, as the unsharded sweep writes with Options.Compare set to more; all of them in one
// set (fileset.CommitFiles).
// Scenario folders stay where the shards wrote them. It fails, writing nothing, when the rows
// come from different sweeps, when two rows files disagree about a scenario, or when a
// scenario is missing (naming the missing indexes and the shards that hold them).
func Merge(dirs []string, out string, more CompareFunc) (*Report, error) {
	var (
		head  *rowsHeader
		from  string
		rows  []Row
		where []string
	)
	var errs []string
	nfiles := 0
	for _, d := range dirs {
		// A shard killed while putting its rows file in place left a journal: finish it.
		if err := fileset.RecoverFiles(d); err != nil {
			return nil, fmt.Errorf("merge: %w", err)
		}
		files, err := findRows(d)
		if err != nil {
			return nil, fmt.Errorf("merge: %w", err)
		}
		if len(files) == 0 {
			errs = append(errs, fmt.Sprintf("%s: no rows file (rows.jsonl or rows-I-of-N.jsonl); is it a sweep output folder?", d))
			continue
		}
		for _, path := range files {
			h, rs, err := readRows(path)
			if err != nil {
				errs = append(errs, err.Error())
				continue
			}
			nfiles++
			if head == nil {
				hh := h
				hh.Shard = ""
				head, from = &hh, path
				rows = make([]Row, h.Scenarios)
				where = make([]string, h.Scenarios)
			} else if h.Sweep != head.Sweep || h.Scenarios != head.Scenarios || !reflect.DeepEqual(h.Keys, head.Keys) {
				errs = append(errs, fmt.Sprintf("%s: rows of another sweep than %s (%d scenarios, sweep %.12s, against %d, %.12s)",
					path, from, h.Scenarios, h.Sweep, head.Scenarios, head.Sweep))
				continue
			} else if h.Units != head.Units {
				errs = append(errs, fmt.Sprintf("%s: rows of scenarios written in %s units, %s's in %s; run the shards with the same --units",
					path, unitsName(h.Units), from, unitsName(head.Units)))
				continue
			}
			for _, r := range rs {
				if where[r.Index] == "" {
					rows[r.Index], where[r.Index] = r, path
					continue
				}
				if !reflect.DeepEqual(rows[r.Index], r) {
					errs = append(errs, fmt.Sprintf("%s: scenario %d (%s) differs from its row in %s; re-run one of them",
						path, r.Index, r.ID, where[r.Index]))
				}
			}
		}
	}
	if len(errs) == 0 && head == nil {
		errs = append(errs, "no rows files found")
	}
	if len(errs) == 0 {
		var missing []int
		for i, w := range where {
			if w == "" {
				missing = append(missing, i)
			}
		}
		if len(missing) > 0 {
			errs = append(errs, fmt.Sprintf("%d of %s missing: %s", len(missing), output.Counted(head.Scenarios, "scenario", "scenarios"), missingText(missing)))
		}
	}
	if len(errs) > 0 {
		return nil, fmt.Errorf("%w: %s", ErrMerge, strings.Join(errs, "\n"))
	}
	files, err := renderRun(*head, rows, Shard{}, more, scenarioDirs(out, rows, where))
	if err != nil {
		return nil, err
	}
	// Merging into one of the shard folders replaces its rows.jsonl, which was read above;
	// every other rows file read is protected, by identity, not by name.
	replaced, _ := os.Stat(filepath.Join(out, RowsFile))
	protect := make([]string, 0, nfiles)
	for _, d := range dirs {
		fs, _ := findRows(d)
		for _, p := range fs {
			if info, err := os.Stat(p); err == nil && replaced != nil && os.SameFile(info, replaced) {
				continue
			}
			protect = append(protect, p)
		}
	}
	if err := fileset.CommitFiles(context.Background(), out, files, protect); err != nil {
		return nil, err
	}
	rep := &Report{Scenarios: head.Scenarios, Run: head.Scenarios}
	for _, r := range rows {
		rep.count(r)
	}
	for _, f := range files {
		rep.Files = append(rep.Files, filepath.Join(out, f.Name))
	}
	return rep, nil
}

// missingText lists missing scenario indexes, with the shard of n that holds each for the
// first few values of n, to tell which array task to run again.
func missingText(missing []int) string {
	var parts []string
	for i, m := range missing {
		if i == 10 {
			parts = append(parts, fmt.Sprintf("and %d more", len(missing)-10))
			break
		}
		parts = append(parts, fmt.Sprintf("#%d", m))
	}
	return strings.Join(parts, ", ") + " (scenario #k is in shard k mod n + 1 of n)"
}

// scenarioDirs returns each scenario's folder relative to out, where the comparison goes:
// the folder of the rows file that held its row, joined with its id, in slashes, each part
// escaped for a URL. When a relative path cannot be made (another volume), the absolute path
// is used as a file URL.
func scenarioDirs(out string, rows []Row, where []string) []string {
	absOut, err := filepath.Abs(out)
	if err != nil {
		return nil
	}
	dirs := make([]string, len(rows))
	for i, r := range rows {
		shard, err := filepath.Abs(filepath.Dir(where[i]))
		if err != nil {
			continue
		}
		rel, err := filepath.Rel(absOut, shard)
		if err != nil {
			dirs[i] = (&url.URL{Scheme: "file", Path: filepath.ToSlash(filepath.Join(shard, r.ID))}).String()
			continue
		}
		var parts []string
		for _, p := range strings.Split(filepath.ToSlash(filepath.Join(rel, r.ID)), "/") {
			parts = append(parts, url.PathEscape(p))
		}
		dirs[i] = strings.Join(parts, "/")
	}
	return dirs
}

// unitsName is a rows header's units as a person reads them: "metric" for "".
func unitsName(u string) string {
	if u == "" {
		return output.UnitsMetric
	}
	return u
}
