package route_test

import (
	"math"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
)

// TestStructuresPassedOneCount plans the demo with 400 m reels (mid-span joins) and holds
// every figure that counts structures passed, cable ends and field enclosures to one count per
// leg (routing.CableTakeoff.Structures, CableTakeoff.CableEnds and Enclosures): slack loops and channel, the
// crew entries, cable end preparation, labelling and enclosure installation.
func TestStructuresPassedOneCount(t *testing.T) {
	t.Parallel()
	r := testplan.DemoDesign(t, func(d *plan.Design) {
		d.ReelM = 400
	})
	d := r.Plan.Design
	var entries, ends, enclosures, joins, transitions int
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		c := l.Cable
		existing := 0
		for _, j := range r.Site.JunctionsOf(l.Steps) {
			if r.Site.LoopStructure(j) {
				existing++
			}
		}
		if c.Structures != existing+c.AddedStructures || c.AddedStructures < len(l.Turns) {
			t.Errorf("%s %s: %d structures passed, want the campus's %d + %d added (turns %v)", l.Link.ID, l.Name, c.Structures, existing, c.AddedStructures, l.Turns)
		}
		if c.StructureLoopM != float64(c.Structures)*d.SlackLoopStructureM {
			t.Errorf("%s %s: structure loops %.1f m for %d structures", l.Link.ID, l.Name, c.StructureLoopM, c.Structures)
		}
		// The channel the loss budget counts holds the loops (route + risers + every slack loop)
		// and the splicing slack of its joins, splice_slack_m at each of a join's two cable
		// ends; at a join in a structure passed the larger of that and the structure's loop,
		// once (common practice, no published source: the coiled ends are the slack stored
		// there), so the join adds to the loop what the ends take beyond it.
		spliceM := 0.0
		for _, p := range c.Splices {
			spliceM += 2 * d.SpliceSlackM
			if !p.NoStructure {
				spliceM -= min(2*d.SpliceSlackM, d.SlackLoopStructureM)
			}
		}
		if math.Abs(c.SpliceSlackM-spliceM) > 1e-9 {
			t.Errorf("%s %s: splicing slack %.1f m for %d joins, want %.1f", l.Link.ID, l.Name, c.SpliceSlackM, c.Joins, spliceM)
		}
		if want := l.RouteM + l.RiserM + c.EndSlackM + c.EntranceLoopM + c.StructureLoopM + c.SpliceSlackM; c.ChannelM != want {
			t.Errorf("%s %s: channel %.3f m, want %.3f", l.Link.ID, l.Name, c.ChannelM, want)
		}
		// Its reels: cut in whole metres, none over reel_m, summing to the cable bought; a join
		// between each two, in a structure passed (or marked as having none), along the
		// channel in travel order.
		sum, prev := 0.0, 0.0
		for k, m := range c.ReelsM {
			sum += m
			if m > d.ReelM || m != float64(int(m)) {
				t.Errorf("%s %s: reel %d of %v m, want whole metres up to %v", l.Link.ID, l.Name, k+1, m, d.ReelM)
			}
		}
		if sum != c.OutsideLengthM() || len(c.ReelsM) != c.Reels || c.Joins != c.Reels-1 || len(c.Splices) != c.Joins {
			t.Errorf("%s %s: reels %v (%d, %d joins at %v) for %v m bought", l.Link.ID, l.Name, c.ReelsM, c.Reels, c.Joins, c.Splices, c.LengthM)
		}
		for _, sp := range c.Splices {
			if sp.ChannelM <= prev || sp.ChannelM >= c.ChannelM || (!sp.NoStructure && sp.ID == "" && sp.Span == "") {
				t.Errorf("%s %s: splice %+v out of order or unplaced (channel %.1f m)", l.Link.ID, l.Name, sp, c.ChannelM)
			}
			prev = sp.ChannelM
		}
		entries += c.Structures * len(c.Cables)
		ends += c.CableEnds()
		enclosures += c.Enclosures()
		joins += c.Joins * len(c.Cables)
		if l.Inside != "" {
			transitions++
			// A transition leg of one cable: its outside cable's 2 ends and the 2 ends of the
			// inside cable at each building of the transition (common practice, no published
			// source).
			if want := 2 + 2*l.InsideAt.Count() + 2*c.Joins; len(c.Cables) == 1 && len(c.InsideCables) == 1 && c.CableEnds() != want {
				t.Errorf("%s %s: %d cable ends, want %d (2 a join)", l.Link.ID, l.Name, c.CableEnds(), want)
			}
		}
	}
	if joins == 0 || transitions == 0 {
		t.Fatalf("the case needs joins and transitions: %d joins, %d transition legs", joins, transitions)
	}
	// The demo's TWR-MTH passes the handhole the plan adds at J0023 and HH-21, MH-12, HH-20
	// (tester's reading of the demo map, 2026-12-04).
	_, twr := testplan.LegOf(t, r, "TWR-MTH")
	if twr.Cable.Structures != 4 || twr.Cable.AddedStructures != 1 {
		t.Errorf("TWR-MTH: %d structures passed (%d added), want 4 (1 added)", twr.Cable.Structures, twr.Cable.AddedStructures)
	}
	b := r.Estimate.BOM
	inBuildings := 0.0
	for _, l := range b.Lines {
		if strings.HasPrefix(l.Item, "fibre enclosure") || strings.HasPrefix(l.Item, "copper patch panel") {
			inBuildings += l.Quantity
		}
	}
	for item, want := range map[string]float64{
		"crew entry into a structure, per cable": float64(entries),
		"cable end preparation":                  float64(ends),
		"enclosure or panel installation":        inBuildings + float64(enclosures),
		"splice closure, mid-span join":          float64(joins),
	} {
		if got := testplan.BOMQty(b, item); got != want {
			t.Errorf("bill %q: %v, want %v", item, got, want)
		}
	}
	if r.Estimate.Bases.CableEnds != ends || r.Estimate.Bases.Structures != entries {
		t.Errorf("bid bases: %d cable ends, %d structures passed; want %d, %d", r.Estimate.Bases.CableEnds, r.Estimate.Bases.Structures, ends, entries)
	}
}
