package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite golden files in testdata/")

// run runs the command line as main would and returns stdout, the error text and the exit status.
func run(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	app := newApp()
	var out, errOut bytes.Buffer
	app.Writer, app.ErrWriter = &out, &errOut
	err := runApp(context.Background(), app, append([]string{"spanwright"}, args...))
	msg := errOut.String()
	if err != nil {
		msg += err.Error()
	}
	return out.String(), msg, exitCode(err)
}

// golden compares got with testdata/golden/name, or rewrites it with -update.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%s: %v (run make golden to create it)", name, err)
	}
	if !bytes.Equal(got, want) {
		gl, wl := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
		for i := 0; i < len(gl) || i < len(wl); i++ {
			var g, w string
			if i < len(gl) {
				g = gl[i]
			}
			if i < len(wl) {
				w = wl[i]
			}
			if g != w {
				t.Fatalf("%s:%d differs (make golden rewrites it after an intended change)\ngot:  %s\nwant: %s", path, i+1, g, w)
			}
		}
	}
}

func TestCheckDemo(t *testing.T) {
	out, msg, code := run(t, "check", "../../testdata/demo/plan.yaml")
	if code != exitOK {
		t.Fatalf("check demo: exit %d: %s", code, msg)
	}
	golden(t, "check_demo.txt", []byte(out))
	for _, want := range []string{"buildings   30 (mc 1, ic 2, served 26, skipped 1: SHD)", "hub         ADM: every building can reach it", `pathways "SR-3" and "T-5" cross`} {
		if !strings.Contains(out, want) {
			t.Errorf("check demo: output lacks %q", want)
		}
	}
}

func TestDemoPlan(t *testing.T) {
	dir := t.TempDir()
	out, msg, code := run(t, "demo", "--out", dir)
	if code != exitOK && code != exitInfeasible {
		t.Fatalf("demo: exit %d: %s", code, msg)
	}
	golden(t, "demo_stdout.txt", []byte(strings.ReplaceAll(out, dir, "OUT")))
	files, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if strings.Contains(f.Name(), ".tmp-") {
			t.Errorf("demo: temporary file %s left behind", f.Name())
		}
		data, err := os.ReadFile(filepath.Join(dir, f.Name()))
		if err != nil {
			t.Fatal(err)
		}
		golden(t, "demo/"+f.Name(), data)
	}
	// Same inputs, same bytes: a second run writes identical files.
	dir2 := t.TempDir()
	if _, msg, code2 := run(t, "demo", "--out", dir2); code2 != code {
		t.Fatalf("demo again: exit %d: %s", code2, msg)
	}
	for _, f := range files {
		a, _ := os.ReadFile(filepath.Join(dir, f.Name()))
		b, _ := os.ReadFile(filepath.Join(dir2, f.Name()))
		if !bytes.Equal(a, b) {
			t.Errorf("demo: %s differs between two runs", f.Name())
		}
	}
}

func TestPlanImperial(t *testing.T) {
	dir := t.TempDir()
	out, msg, code := run(t, "plan", "testdata/plans/ok.yaml", "--out", dir, "--units", "imperial")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, msg)
	}
	if !strings.Contains(out, " ft of route") {
		t.Errorf("stdout not in feet: %s", out)
	}
	csv, _ := os.ReadFile(filepath.Join(dir, "links.csv"))
	if !strings.Contains(string(csv), "route_ft") {
		t.Errorf("links.csv header not in feet: %s", csv)
	}
	js, _ := os.ReadFile(filepath.Join(dir, "summary.json"))
	if !strings.Contains(string(js), `"total_route_m"`) {
		t.Errorf("summary.json must stay metric: %s", js)
	}
}

func TestBadInput(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		want []string
	}{
		{"no arguments", []string{"check"}, exitInvalid, []string{"name a plan file"}},
		{"missing out", []string{"plan", "testdata/plans/ok.yaml"}, exitInvalid, []string{`Required flag "out"`}},
		{"unknown flag", []string{"plan", "testdata/plans/ok.yaml", "--bogus"}, exitInvalid, []string{"bogus"}},
		{"bad units", []string{"check", "--units", "cubits", "testdata/plans/ok.yaml"}, exitInvalid, []string{`--units: want metric or imperial, got "cubits"`}},
		{"missing plan", []string{"plan", "testdata/plans/none.yaml", "--out", "x"}, exitInvalid, []string{"none.yaml"}},
		{"not json", []string{"check", "../../testdata/bad/not_json.geojson"}, exitInvalid, []string{"not_json.geojson"}},
		// A reel of 100 m with 47.6 m of splicing slack an end carries 4 cm of route: refused,
		// not planned for minutes (review 15 F5; plan.MinReelRouteM).
		{"splice slack leaving a reel no route", []string{"plan", "testdata/plans/reel_slack.yaml", "--out", "x"}, exitInvalid,
			[]string{`reel_slack.yaml:5:39: design.splice_slack_m: want at most 47.11 metres: a reel carries reel_m / (1 + waste_pct/100) = 95.24 m of channel`}},
		{"unknown hub", []string{"plan", "testdata/plans/unknown_hub.yaml", "--out", "x"}, exitInvalid, []string{`unknown_hub.yaml:3:6: hub: want the id of a building, got "NOPE", which no building has`}},
		{"unknown link buildings, all reported", []string{"plan", "testdata/plans/unknown_link.yaml", "--out", "x"}, exitInvalid,
			[]string{`unknown_link.yaml:5:10: links[1].to: want the id of a building, got "GHOST", which no building has`, `unknown_link.yaml:6:12: links[2].from: want the id of a building, got "PHANTOM", which no building has`}},
		// Every problem at once: the plan's own (a misspelt key, a number out of range) and
		// those only its campus shows (an unknown building), for plan and for check alike.
		{"plan and campus problems in one run", []string{"plan", "testdata/plans/typo_and_unknown.yaml", "--out", "x"}, exitInvalid,
			[]string{`typo_and_unknown.yaml:4:3: design.slak_m: unknown key; did you mean slack_m?`, `typo_and_unknown.yaml:5:11: design.snap_m: want metres above 0`,
				`typo_and_unknown.yaml:8:10: links[1].to: want the id of a building, got "GHOST", which no building has`, `typo_and_unknown.yaml:8:17: links[1].strandz: unknown key; did you mean strands?`}},
		{"an unknown hub hides no other problem", []string{"plan", "testdata/plans/unknown_hub_and_more.yaml", "--out", "x"}, exitInvalid,
			[]string{`unknown_hub_and_more.yaml:3:6: hub: want the id of a building, got "NOPE"`, `unknown_hub_and_more.yaml:6:10: links[1].to: want the id of a building, got "GHOST", which no building has`,
				`unknown_hub_and_more.yaml:7:22: links[2].rate: rate "11G": no application runs at 11G`}},
		// One handhole of the campus with longitude and latitude swapped, 7,866 km off: refused
		// with the slip named, never planned on a projection it stretches (tester 13 F-C).
		{"a stray far feature", []string{"plan", "testdata/plans/stray.yaml", "--out", "x"}, exitInvalid,
			[]string{`stray.geojson: feature #1 "HH-99": geometry: want positions within 100 km of the middle of the campus (-1.49685, 53.0001), got 53.0001, -1.4975, 7866 km away; longitude and latitude swapped?`}},
		{"check: a stray far feature", []string{"check", "testdata/plans/stray.yaml"}, exitInvalid,
			[]string{`feature #1 "HH-99": geometry: want positions within 100 km`}},
		// check as plan: the hub's problem and the links' at once (it gave the hub's alone).
		{"check: an unknown hub hides no other problem", []string{"check", "testdata/plans/unknown_hub_and_more.yaml"}, exitInvalid,
			[]string{`unknown_hub_and_more.yaml:3:6: hub: want the id of a building, got "NOPE"`,
				`unknown_hub_and_more.yaml:6:10: links[1].to: want the id of a building, got "GHOST", which no building has`}},
		{"check: plan and campus problems in one run", []string{"check", "testdata/plans/typo_and_unknown.yaml"}, exitInvalid,
			[]string{`design.slak_m: unknown key`, `links[1].to: want the id of a building, got "GHOST", which no building has`}},
		// A warning's length in the run's units: 0.5 m is 1.6 ft (1 ft = 0.3048 m exactly, NIST SP 811 B.8).
		{"check in feet", []string{"check", "--units", "imperial", "testdata/plans/island.yaml"}, exitInfeasible,
			[]string{"building footprint within 1.6 ft (design: snap_m)"}},
		{"check names unreachable", []string{"check", "testdata/plans/island.yaml"}, exitInfeasible, []string{"cannot reach the hub HQ: [ISLE]",
			"network     in 2 separate pieces that each hold buildings; 1 building is off the hub's piece: [ISLE]\n",
			"cut off: building ISLE is cut off from HQ: the pathways that reach it (D2) join none that reaches HQ"}},
		// BACK is joined to HQ only by D2, which ends inside MID apart from D1's end: plan
		// cannot route HQ-BACK (transit: true on MID would not help), so check says so, with
		// what would serve it, and exits 3 as plan does.
		{"check names through-only", []string{"check", "testdata/plans/through.yaml"}, exitInfeasible, []string{
			"hub         HQ: 1 building reaches it only through another building (below); every other building can reach it\n",
			"  no route: building BACK reaches HQ only through MID: ",
			"transit: true on MID would not do, its pathways do not meet at one point inside it",
			"or serve it from MID (role ic, and a link from it)",
			"1 building reaches the hub HQ only through another building routes may not cross: [BACK]"}},
		// The same campus with BACK served from MID, which it reaches directly: plan routes
		// MID-BACK, so check lists BACK as served that way and exits 0.
		{"check through served from MID", []string{"check", "testdata/plans/through_ic.yaml"}, exitOK, []string{
			"hub         HQ: every building can reach its cross-connect in the plan; 1 building reaches the hub only through another building (below)\n",
			"through     1 building reaches the hub only through another building, and the plan serves it from a cross-connect it reaches: [BACK]\n"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			out, msg, code := run(t, tc.args...)
			if code != tc.code {
				t.Errorf("%s: exit %d, want %d (%s)", tc.name, code, tc.code, msg)
			}
			for _, w := range tc.want {
				if !strings.Contains(out+msg, w) {
					t.Errorf("%s: output %q lacks %q", tc.name, out+msg, w)
				}
			}
		})
	}
	if _, err := os.Stat("x"); err == nil {
		t.Errorf("a failed plan created its output folder")
		os.RemoveAll("x")
	}
}

// TestCopperReasonNamesItsWay: a link no medium can route (fibre out of reach, copper kept off
// outdoor spans by copper-outdoor, NFPA 70 800.90) says of copper what on the way between its
// buildings keeps it out, the aerial span and the rule, not every kind of span of the campus
// it may not use (the tunnel to NEAR is off the way). It comes after the fibre options, which
// the rules let onto the pathways (tester 12 F5).
func TestCopperReasonNamesItsWay(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	stdout, msg, code := run(t, "plan", "testdata/plans/far.yaml", "--out", out)
	if code != exitInfeasible {
		t.Fatalf("exit %d, want %d (%s)", code, exitInfeasible, msg)
	}
	const want = "; cat6a: every pathway between HQ and FAR runs on spans it may not use; the shortest runs on aerial spans (cat6a rejected by copper-outdoor: the channel leaves the building"
	if !strings.Contains(stdout, want) {
		t.Errorf("output lacks %q:\n%s", want, stdout)
	}
	if !strings.Contains(stdout, "HQ-FAR/primary: om3: ") {
		t.Errorf("the reason does not lead with fibre:\n%s", stdout)
	}
	for _, line := range strings.Split(stdout, "\n") {
		if strings.Contains(line, "HQ-FAR/primary") && strings.Contains(line, "tunnel") {
			t.Errorf("the reason names the tunnel, off the link's way: %s", line)
		}
	}
}

// TestCutOffBuilding: a building no pathway joins to the hub's network does not stop the
// plan (issue 13): its leg is infeasible with a reason that names the pathway left apart,
// every other link is planned and written, and the exit status is 3, as for any infeasible leg.
func TestCutOffBuilding(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	stdout, msg, code := run(t, "plan", "testdata/plans/island.yaml", "--out", out)
	if code != exitInfeasible {
		t.Fatalf("exit %d, want %d (%s)", code, exitInfeasible, msg)
	}
	const why = "building ISLE is cut off from HQ: the pathways that reach it (D2) join none that reaches HQ"
	if !strings.Contains(stdout+msg, why) {
		t.Errorf("output lacks %q:\n%s%s", why, stdout, msg)
	}
	// The list is printed once, in the summary; the error counts the legs and points at it.
	if n := strings.Count(stdout+msg, why); n != 1 {
		t.Errorf("the leg's reason printed %d times, want once:\n%s%s", n, stdout, msg)
	}
	if want := "1 infeasible link leg, listed above"; msg != want {
		t.Errorf("error %q, want %q", msg, want)
	}
	links, err := os.ReadFile(filepath.Join(out, "links.csv"))
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(links)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	got := map[string]string{}
	for _, r := range rows[1:] {
		got[r[col["link"]]] = r[col["feasible"]] + " " + r[col["reason"]]
	}
	if !strings.HasPrefix(got["HQ-NEAR"], "true ") || got["HQ-ISLE"] != "false "+why {
		t.Errorf("links.csv: %q", got)
	}
}

func TestIntersperse(t *testing.T) {
	app := newApp()
	got := strings.Join(intersperse(app, []string{"spanwright", "plan", "p.yaml", "--out", "d", "--units=imperial"}), " ")
	if want := "spanwright plan --out d --units=imperial p.yaml"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
}

// TestCheckDiverseAsPlan: a diverse link that can have no second route (its only pathway one
// tunnel; or its two ducts in one trench, one shared-risk group) makes plan finish with its
// diverse leg infeasible (exit 3), so check reports it beforehand and exits 3 too, naming the
// building and giving the reason in plan's own words. Routes that share one trench are not
// diverse: ANSI/TIA-569 asks redundant pathways to take physically separate routes (from
// memory); two ducts in trenches of their own are diverse, and both commands exit 0.
func TestCheckDiverseAsPlan(t *testing.T) {
	cases := []struct {
		plan, building string
		code           int
	}{
		{"diverse_far", "NEAR", exitInfeasible},
		{"diverse_trench", "LAB", exitInfeasible},
		{"diverse_apart", "", exitOK},
	}
	for _, tc := range cases {
		t.Run(tc.plan, func(t *testing.T) {
			path := "testdata/plans/" + tc.plan + ".yaml"
			planOut, planMsg, planCode := run(t, "plan", path, "--out", t.TempDir())
			checkOut, checkMsg, checkCode := run(t, "check", path)
			if planCode != tc.code || checkCode != tc.code {
				t.Fatalf("%s: plan exit %d, check exit %d, want %d for both (%s; %s)", tc.plan, planCode, checkCode, tc.code, planMsg, checkMsg)
			}
			if tc.code == exitOK {
				return
			}
			// plan's line for the leg: "  HQ-NEAR/diverse: no diverse route: …".
			var leg string
			for _, l := range strings.Split(planOut, "\n") {
				if l = strings.TrimSpace(l); strings.Contains(l, "/diverse: no diverse route: ") {
					leg = l
				}
			}
			if leg == "" {
				t.Fatalf("%s: plan names no diverse leg without a route:\n%s", tc.plan, planOut)
			}
			want := "building " + tc.building + ", " + leg
			// The error counts the links and points to the report, as plan's does (a campus
			// can have dozens, each with a long reason; tester: 9,173 characters on one line).
			if c := "1 diverse link has no second route, as plan would find, listed above"; !strings.Contains(checkMsg, c) || strings.Contains(checkMsg, leg) {
				t.Errorf("%s: check's error says\n%s\nwant %q, without the reason", tc.plan, checkMsg, c)
			}
			if !strings.Contains(checkOut, "diverse     1 diverse link has no second route, however planned:\n  "+want+"\n") {
				t.Errorf("%s: check's report lacks the link:\n%s", tc.plan, checkOut)
			}
		})
	}
}

// TestCheckNoHubAsPlan: a plan that names no hub on a campus without an mc building, with a
// misspelt rate, is refused by check as by plan (exit 2, both problems named): check ran the
// plan's own checks only once it had a hub, and passed it. The project's own rule (README,
// check rejects what plan rejects before routing): no outside source.
func TestCheckNoHubAsPlan(t *testing.T) {
	path := "testdata/plans/nohub.yaml"
	_, planMsg, planCode := run(t, "plan", path, "--out", t.TempDir())
	_, checkMsg, checkCode := run(t, "check", path)
	if planCode != exitInvalid || checkCode != exitInvalid {
		t.Fatalf("plan exit %d, check exit %d, want %d for both (%s; %s)", planCode, checkCode, exitInvalid, planMsg, checkMsg)
	}
	for _, want := range []string{"hub: missing", `rate "7Q"`} {
		if !strings.Contains(checkMsg, want) || !strings.Contains(planMsg, want) {
			t.Errorf("%q: check said %q, plan said %q; want it in both", want, checkMsg, planMsg)
		}
	}
}
