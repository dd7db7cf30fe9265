package main

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"
	"time"
)

// readSet reads every file in dir but those named in skip.
func readSet(t *testing.T, dir string, skip ...string) map[string][]byte {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]byte{}
	for _, e := range ents {
		if e.IsDir() || slices.Contains(skip, e.Name()) {
			continue
		}
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = data
	}
	return out
}

func sameSet(a, b map[string][]byte) bool {
	if len(a) != len(b) {
		return false
	}
	for n, x := range a {
		if y, ok := b[n]; !ok || !bytes.Equal(x, y) {
			return false
		}
	}
	return true
}

// leftovers lists the entries of dir that start with a dot.
func leftovers(dir string) []string {
	ents, _ := os.ReadDir(dir)
	var out []string
	for _, e := range ents {
		if strings.HasPrefix(e.Name(), ".") {
			out = append(out, e.Name())
		}
	}
	sort.Strings(out)
	return out
}

// writing reports whether the process pid has a temporary folder in dir.
func writing(dir string, pid int) bool {
	for _, h := range leftovers(dir) {
		if strings.Contains(h, fmt.Sprintf("-%d-", pid)) {
			return true
		}
	}
	return false
}

// TestPlanKilledWhileWriting kills a plan with SIGKILL (nothing runs after it) at random
// moments, alternating metric and imperial runs so that the old and the new set differ:
// after every kill the output folder holds one whole set (every file of the metric outputs
// or every file of the imperial ones) and the user's file in it is the same file with the
// same bytes; a completed run then leaves no temporary folder or file. Before the outputs
// were swapped in as one folder, 5 of 400 such kills left new bom.csv and bom.xlsx beside
// old links.csv, routes.geojson and report.html, and the temporary files stayed.
func TestPlanKilledWhileWriting(t *testing.T) {
	if testing.Short() {
		t.Skip("starts 40 plans and kills them")
	}
	t.Parallel()
	dir := t.TempDir()
	plan, err := filepath.Abs("testdata/plans/ok.yaml")
	if err != nil {
		t.Fatal(err)
	}
	units := []string{"metric", "imperial"}
	sets := map[string]map[string][]byte{}
	for _, u := range units {
		ref := filepath.Join(dir, "ref-"+u)
		if _, msg, code := run(t, "plan", plan, "--out", ref, "--units", u); code != exitOK {
			t.Fatalf("%s: status %d: %s", u, code, msg)
		}
		sets[u] = readSet(t, ref)
	}
	if sameSet(sets["metric"], sets["imperial"]) {
		t.Fatal("the metric and imperial sets are the same bytes; the test cannot tell old from new")
	}
	out := filepath.Join(dir, "out")
	if _, msg, code := run(t, "plan", plan, "--out", out); code != exitOK {
		t.Fatalf("status %d: %s", code, msg)
	}
	notes := filepath.Join(out, "notes.txt")
	if err := os.WriteFile(notes, []byte("the user's own file"), 0o644); err != nil {
		t.Fatal(err)
	}
	notesInfo, _ := os.Stat(notes)

	// Each step of writing (a file, a link, the switch, the removal) waits 3 ms in the child,
	// so about 30 ms of its life is spent writing; half the kills come at a random moment of
	// a whole run's time, half at a random moment after its new folder appears.
	const tries = 40
	const step = 3 * time.Millisecond
	child := func(u string) *exec.Cmd {
		cmd := exec.Command(os.Args[0], "plan", plan, "--out", out, "--units", u)
		cmd.Env = append(os.Environ(), "SPANWRIGHT_AS_MAIN=1", "SPANWRIGHT_STEP_DELAY="+step.String())
		return cmd
	}
	start := time.Now()
	if err := child("metric").Run(); err != nil {
		t.Fatal(err)
	}
	whole := time.Since(start) // a whole run, start-up and writing included
	rng := rand.New(rand.NewPCG(11, 11))
	outcomes := map[string]int{}
	for i := 0; i < tries; i++ {
		u := units[(i+1)%2]
		cmd := child(u)
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		done := make(chan error, 1)
		go func() { done <- cmd.Wait() }()
		if i%2 == 0 {
			time.Sleep(time.Duration(rng.Int64N(int64(whole))))
		} else {
			ended := false
			for !ended && !writing(dir, cmd.Process.Pid) {
				select {
				case err := <-done:
					if err != nil {
						t.Fatalf("kill %d: the plan failed: %v: %s", i, err, stderr.String())
					}
					done <- err // seen finishing, before the poll saw its folder
					ended = true
				case <-time.After(200 * time.Microsecond):
				}
			}
			time.Sleep(time.Duration(rng.Int64N(int64(12 * step))))
		}
		cmd.Process.Kill()
		if err := <-done; err == nil {
			outcomes["finished"]++ // a loaded machine may let it finish first
		}

		got := readSet(t, out, "notes.txt")
		switch {
		case sameSet(got, sets["metric"]):
			outcomes["metric"]++
		case sameSet(got, sets["imperial"]):
			outcomes["imperial"]++
		default:
			var names []string
			for n := range got {
				names = append(names, n)
			}
			sort.Strings(names)
			t.Fatalf("kill %d: the output folder holds neither whole set: %v", i, names)
		}
		if writing(dir, cmd.Process.Pid) {
			outcomes["caught writing"]++ // its temporary folder is left for the next run
		}
		info, err := os.Stat(notes)
		if data, _ := os.ReadFile(notes); err != nil || !os.SameFile(info, notesInfo) || string(data) != "the user's own file" {
			t.Fatalf("kill %d: the user's file was not kept: %v", i, err)
		}
	}
	t.Logf("after %d kills: %v", tries, outcomes)
	// Where the kills land depends on the machine's load: a kill inside the writing is what
	// the test is for, so at least one must land there; whether some also land after the
	// switch varies (on a loaded machine the switch may never come within the window).
	if outcomes["caught writing"] == 0 {
		t.Errorf("outcomes %v: no kill landed inside the writing", outcomes)
	}
	if _, msg, code := run(t, "plan", plan, "--out", out); code != exitOK {
		t.Fatalf("status %d: %s", code, msg)
	}
	if !sameSet(readSet(t, out, "notes.txt"), sets["metric"]) {
		t.Errorf("the completed run did not write the metric set")
	}
	if left := append(leftovers(dir), leftovers(out)...); len(left) > 0 {
		t.Errorf("left after a completed run: %v", left)
	}
}
