package output

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestStructuresOfDemo holds the structures table of the demo to the figures the bill and
// the takeoff count on their own: one row per handhole the bill prices, the slack loops the
// takeoff counts at existing structures, the pull sections' ends, and every existing
// structure where the campus draws it.
func TestStructuresOfDemo(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	sts, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	toBuild, loops := 0, 0
	byID := map[string]Structure{}
	for i, st := range sts {
		if st.Mark != i+1 {
			t.Fatalf("row %d: mark %d", i, st.Mark)
		}
		if st.ID != "" {
			byID[st.ID] = st
		}
		switch st.Status {
		case StructureToBuild:
			toBuild++
			if i > 0 && sts[i-1].Status == StructureExisting {
				t.Errorf("%d %s: a handhole to build after an existing structure", st.Mark, st.ID)
			}
		case StructureExisting:
			if strings.Contains(st.Purpose, PurposeSlackLoop) {
				loops += len(st.Legs)
			}
		default:
			t.Errorf("%d: status %q", st.Mark, st.Status)
		}
		if len(st.Legs) == 0 {
			t.Errorf("%d %s: no leg through it", st.Mark, st.Place(metresOf))
		}
	}
	// As many handholes to build as the bill counts (routing.Handhole per junction, run
	// handholes along new construction, the pulling plan's added pull points).
	e := r.Estimate
	if want := len(r.Handholes) + len(e.Construction.RunHandholes) + e.AddedPullPoints; toBuild != want || want == 0 {
		t.Errorf("to build: %d rows, the bill counts %d", toBuild, want)
	}
	// The slack loops at existing structures: one per leg per structure passed, as the
	// takeoff counts them (routing.CableTakeoff.Structures, bom.xlsx's structures passed, less
	// the handholes the plan builds, AddedStructures, which are rows to build).
	want := 0
	for i := range r.Legs {
		if r.Legs[i].Feasible {
			want += r.Legs[i].Cable.Structures - r.Legs[i].Cable.AddedStructures
		}
	}
	if loops != want || want == 0 {
		t.Errorf("legs through existing structures with a slack loop: %d, the takeoff counts %d", loops, want)
	}
	// Every pull section's end at an existing structure is a pull point there.
	for _, p := range e.Pulls {
		for _, id := range []string{p.From.ID, p.To.ID} {
			if r.Site.IsStructure(id) && !strings.Contains(byID[id].Purpose, PurposePullPoint) {
				t.Errorf("pull %s to %s: %s not marked %q (%q)", p.From, p.To, id, PurposePullPoint, byID[id].Purpose)
			}
		}
	}
	// Existing structures where the campus draws them; turns where the legs turn.
	for _, cs := range r.Site.Campus.Structures {
		st, ok := byID[cs.ID]
		if !ok {
			continue
		}
		if st.Point != geo.Rounded(cs.Point) || st.Type != cs.Type {
			t.Errorf("%s: %v %s, the campus has %v %s", cs.ID, st.Point, st.Type, cs.Point, cs.Type)
		}
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		for _, j := range l.Turns {
			if st, ok := byID[j]; !ok || st.Status != StructureToBuild || !slices.Contains(st.Legs, l.Label()) {
				t.Errorf("%s turns at %s: row %+v", l.Label(), j, st)
			}
		}
	}
}

// metresOf writes metres with their unit, for test messages.
func metresOf(m float64) string { return LengthText(WriteOptions{}, m) }

// TestDuctLegs holds the duct assignment to the legs: on every span of the duct fill, each
// leg on the span is named once per cable it pulls (routing.CableTakeoff.Cables), over the
// span's ducts and its row of cables that fit none, and each duct names one leg per cable
// whose diameter it counts.
func TestDuctLegs(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	got := map[string]map[string]int{}
	for _, f := range r.Estimate.Fill {
		if len(f.Legs) != len(f.CablesODMM) {
			t.Errorf("span %s duct %d: %d legs for %d cables", f.Span, f.Duct, len(f.Legs), len(f.CablesODMM))
		}
		if got[f.Span] == nil {
			got[f.Span] = map[string]int{}
		}
		for _, l := range f.Legs {
			got[f.Span][l]++
		}
	}
	if len(got) == 0 {
		t.Fatal("no duct fill")
	}
	want := map[string]map[string]int{}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		for _, st := range l.Steps {
			if got[st.SpanID] != nil {
				if want[st.SpanID] == nil {
					want[st.SpanID] = map[string]int{}
				}
				want[st.SpanID][l.Label()] += len(l.Cable.Cables)
			}
		}
	}
	for span, on := range got {
		if !maps.Equal(on, want[span]) {
			t.Errorf("span %s: ducts name %v, the legs on it pull %v", span, on, want[span])
		}
	}
}

// TestListCell: a list longer than a workbook cell holds (Excel specifications and limits:
// 32,767 characters in a cell) keeps whole ids and counts the rest.
func TestListCell(t *testing.T) {
	t.Parallel()
	ids := make([]string, 5000)
	for i := range ids {
		ids[i] = "L-" + strings.Repeat("x", 10) + "/primary"
	}
	got := listCell(ids, "plan.gpkg")
	if len(got) > 32767 || !strings.HasSuffix(got, " more, all in plan.gpkg") {
		t.Fatalf("%d characters, ends %q", len(got), got[len(got)-40:])
	}
	kept := strings.Count(got, "/primary")
	if !strings.Contains(got, " and "+strconv.Itoa(len(ids)-kept)+" more") {
		t.Errorf("kept %d, text ends %q", kept, got[len(got)-40:])
	}
	if short := listCell(ids[:3], "x"); short != strings.Join(ids[:3], " ") {
		t.Errorf("short list %q", short)
	}
}

// TestStructuresTableIsTheSchedule: a crew placing slack loops by the structures table and a
// buyer cutting cable by links.csv's schedule see the same structures (regression trial,
// finding 2: the table listed legs straight through handholes the schedule did not count, and
// the schedule counted a handhole twice where a leg both turned and joined new pathway). For
// every feasible leg of the demo and of the generated campuses of 40 and 200 buildings
// (campusfiles, seed 1): the rows of the table that store slack loops (all but existing pull
// boxes and vaults and the pulling plan's handholes) and list the leg are the structures
// links.csv's structures_passed counts (routing.CableTakeoff.Passed), none twice; its slack
// loops at them are that count times design.slack_loop_structure_m, one loop at each
// maintenance hole or handhole passed (README; a slack loop is stored in each structure the
// cable passes: TIA-758-B, from memory), and links.csv's slack_loops_m adds the service coils,
// the entrance loops and the splicing slack of its joins (2 × design.splice_slack_m a join). And the terminal's count of turn handholes with the turns in handholes
// added for another purpose names as many junctions as links.csv's turns (finding 7).
func TestStructuresTableIsTheSchedule(t *testing.T) {
	t.Parallel()
	for _, tc := range []plannedCase{demoCase, campusCase(40), campusCase(200)} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r := tc.solve(t)
			sts, err := StructuresOf(r)
			if err != nil {
				t.Fatal(err)
			}
			table := map[string][]string{} // leg label → the loop-storing rows listing it
			for _, st := range sts {
				loops := (st.Status == StructureToBuild && st.Purpose != PurposePull) ||
					(st.Status == StructureExisting && strings.Contains(st.Purpose, PurposeSlackLoop))
				if loops {
					for _, l := range st.Legs {
						table[l] = append(table[l], st.Place(metresOf))
					}
				}
			}
			d := r.Plan.Design
			opt := WriteOptions{}
			head := scheduleHead(opt)
			col := func(name string) int { return slices.Index(head, name) }
			checked, passes := 0, 0
			turns := map[string]bool{}
			for i := range r.Legs {
				l := &r.Legs[i]
				if !l.Feasible {
					continue
				}
				label := l.Label()
				row := scheduleOf(r, i).text(opt)
				var passed []string
				for _, p := range l.Cable.Passed {
					passed = append(passed, Structure{ID: p.ID, Span: p.Span, AtM: p.AtM}.Place(metresOf))
				}
				if got := row[col("structures_passed")]; got != strconv.Itoa(len(passed)) {
					t.Errorf("%s: structures_passed %s, its list %d: %q", label, got, len(passed), passed)
				}
				listed := slices.Clone(table[label])
				slices.Sort(passed)
				slices.Sort(listed)
				if len(slices.Compact(slices.Clone(passed))) != len(passed) || len(slices.Compact(slices.Clone(listed))) != len(listed) {
					t.Errorf("%s: a structure twice: schedule %q, table %q", label, passed, listed)
				}
				if !slices.Equal(passed, listed) {
					t.Errorf("%s: schedule passes %q, the structures table lists it at %q", label, passed, listed)
				}
				delete(table, label)
				if want := float64(len(passed)) * d.SlackLoopStructureM; math.Abs(l.Cable.StructureLoopM-want) > 1e-9 {
					t.Errorf("%s: structure loops %.2f m, want %d × %.2f m", label, l.Cable.StructureLoopM, len(passed), d.SlackLoopStructureM)
				}
				slack, err := strconv.ParseFloat(row[col("slack_loops_m")], 64)
				want := l.Cable.EndSlackM + l.Cable.EntranceLoopM + float64(len(passed))*d.SlackLoopStructureM
				for _, p := range l.Cable.Splices { // a join in a structure passed: the larger of its ends' slack and the loop, once
					want += 2 * d.SpliceSlackM
					if !p.NoStructure {
						want -= min(2*d.SpliceSlackM, d.SlackLoopStructureM)
					}
				}
				if err != nil || math.Abs(slack-want) > 0.05 {
					t.Errorf("%s: slack_loops_m %q, want %.1f", label, row[col("slack_loops_m")], want)
				}
				for _, j := range l.Turns {
					turns[j] = true
				}
				checked++
				passes += len(passed)
			}
			for l, at := range table {
				t.Errorf("the structures table lists %s, no feasible leg, at %q", l, at)
			}
			var out strings.Builder
			if err := PrintSummary(&out, r, opt); err != nil {
				t.Fatal(err)
			}
			var n, more int
			for _, line := range strings.Split(out.String(), "\n") {
				if _, rest, ok := strings.Cut(line, "where a route turns between pathways: "); ok {
					fmt.Sscanf(rest, "%d", &n)
					if _, m, ok := strings.Cut(rest, "; "); ok {
						fmt.Sscanf(m, "%d more", &more)
					}
				}
			}
			if n+more != len(turns) {
				t.Errorf("terminal: %d turn handholes and %d more turns, links.csv's turns name %d junctions", n, more, len(turns))
			}
			t.Logf("%s: %d legs, %d structures passed, %d turn junctions (%d in turn handholes)", tc.name, checked, passes, len(turns), n)
		})
	}
}

// TestRunHandholeNamesItsEnd: a new duct of 590 m from hub A's east wall (x = 10 m) to C's
// west wall (x = 600 m), drawn from C, gets handholes every 150 m (handhole_spacing_m); each
// row of the structures table names the end its distance counts from, a building, and stands
// that far from that building's wall (tester 8 finding 9: "new handhole on N-GRH at 150.0 m"
// was counted from an end it did not name, and read as a chainage from the other).
func TestRunHandholeNamesItsEnd(t *testing.T) {
	t.Parallel()
	duct := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P1","type":"duct","status":"proposed","method":"trench"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
		testsite.X(600), testsite.Y(0), testsite.X(10), testsite.Y(0))
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{testsite.Box("A", "mc", 0, 0), testsite.Box("C", "", 610, 0), duct}, ",") + `]}`
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	sts, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	wallM := map[string]float64{"A": 10, "C": 600}
	metres := func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }
	runs := 0
	for _, st := range sts {
		if st.Purpose != PurposeRun {
			continue
		}
		runs++
		wall, ok := wallM[st.End]
		want := "new handhole on P1, " + metres(st.AtM) + " from the " + st.End + " end"
		if got := st.Place(metres); !ok || got != want {
			t.Errorf("structure %d: %q (end %q), want %q with the end a building, A or C", st.Mark, got, st.End, want)
			continue
		}
		// Where it stands, in metres east of A's centre on the grid (testsite.X inverted, a
		// sphere's metres: within 1 % of the ellipsoid's, which tells the ends apart 10 m or
		// more).
		x := (st.Point[0] + 1) * 111320 * math.Cos(testsite.Lat*math.Pi/180)
		if math.Abs(math.Abs(x-wall)-st.AtM) > 0.01*st.AtM {
			t.Errorf("%s stands %.1f m from %s's wall", st.Place(metres), math.Abs(x-wall), st.End)
		}
	}
	if runs != 3 {
		t.Errorf("%d handholes along the new duct, want 3 (590 m at 150 m spacing)", runs)
	}
}

// TestStructuresCoiled: the structures table's "coiled there" is what the crew racks in each
// structure over every cable: a slack loop of design.slack_loop_structure_m per cable of each
// leg whose structures passed hold it (TIA-758-B, from memory: slack is stored in the
// structures a cable passes), and at a mid-span join the splicing slack of both cable ends,
// 2 × design.splice_slack_m per cable (common practice, no published source: the join is made
// above ground and the slack stored with the closure); at a join in a structure the cable
// passes, the larger of that and the slack loop, once (the coiled ends are the slack stored
// there; common practice, no published source). The demo on 400 m reels, where joins go
// in maintenance holes, handholes and splice points to build: each row is worked out again
// from the legs' own lists, and the rows add up to every leg's loops and splicing slack but
// that of joins off the spans (in a riser, slack loop or lateral), which have no row.
func TestStructuresCoiled(t *testing.T) {
	t.Parallel()
	r := testplan.DemoDesign(t, func(d *plan.Design) { d.ReelM = 400 })
	d := r.Plan.Design
	sts, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	type key struct {
		id, span string
		atM      float64
	}
	want, total, joinsThere := map[key]float64{}, 0.0, 0
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		cables := float64(len(l.Cable.Cables))
		for _, p := range l.Cable.Passed {
			want[key{p.ID, p.Span, p.AtM}] += d.SlackLoopStructureM * cables
			total += d.SlackLoopStructureM * cables
		}
		for _, p := range l.Cable.Splices {
			k := key{p.ID, p.Span, p.AtM}
			if p.NoStructure {
				if p.Span == "" {
					continue // off the spans: no row
				}
				k = key{"", p.Span, math.Round(p.AtM*10) / 10}
			}
			joinM := 2 * d.SpliceSlackM
			if !p.NoStructure {
				// A join in a structure passed: the larger of the ends' slack and the loop, once.
				joinM = max(joinM, d.SlackLoopStructureM) - d.SlackLoopStructureM
			}
			want[k] += joinM * cables
			total += joinM * cables
			joinsThere++
		}
	}
	if joinsThere == 0 {
		t.Fatal("the case needs joins in structures")
	}
	sum, joinRows := 0.0, 0
	for _, st := range sts {
		k := key{st.ID, st.Span, st.AtM}
		if st.Purpose == PurposeSplice {
			k.atM = math.Round(st.AtM*10) / 10
		}
		if math.Abs(st.CoiledM-want[k]) > 1e-6 {
			t.Errorf("%s (%s): coiled %.1f m, want %.1f", st.Place(metresOf), st.Purpose, st.CoiledM, want[k])
		}
		if len(st.Joined) > 0 {
			joinRows++
		}
		sum += st.CoiledM
	}
	if math.Abs(sum-total) > 1e-6 || joinRows == 0 {
		t.Errorf("coiled over the table %.1f m, want %.1f (%d rows with joins)", sum, total, joinRows)
	}
}
