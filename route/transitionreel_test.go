package route_test

import (
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
)

// TestTransitionReelsOutsideOnly plans the demo with 1,400 m reels: a leg with an entrance
// transition is outside-plant cable between the two transition splices and inside pieces cut
// from other reels, so its reels and mid-span joins are counted over the outside cable only
// (a reel carries one continuous length, TIA-758-B splices only where a reel ends: from
// memory). TWR-BRN's outside cable fits one reel: no join, no splice in its loss budget (review
// 4 F7: it was cut into two reels over the whole cable, risers included).
func TestTransitionReelsOutsideOnly(t *testing.T) {
	t.Parallel()
	r := testplan.DemoDesign(t, func(d *plan.Design) {
		d.ReelM = 1400
	})
	checked := 0
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible || l.Inside == "" {
			continue
		}
		c := l.Cable
		out := c.OutsideLengthM()
		sum := 0.0
		for _, m := range c.ReelsM {
			sum += m
		}
		if sum != out || len(c.ReelsM) != c.Joins+1 {
			t.Errorf("%s %s: reels %v for %.0f m of outside cable, %d joins", l.Link.ID, l.Name, c.ReelsM, out, c.Joins)
		}
		if out <= r.Plan.Design.ReelM && c.Joins != 0 {
			t.Errorf("%s %s: %.0f m of outside cable fits one %.0f m reel, yet %d joins at %v", l.Link.ID, l.Name, out, r.Plan.Design.ReelM, c.Joins, c.Splices)
		}
		if l.Link.ID == "TWR-BRN" {
			checked++
			if c.Joins != 0 || len(c.ReelsM) != 1 || c.LengthM <= r.Plan.Design.ReelM {
				t.Errorf("TWR-BRN: %d joins, reels %v, %.0f m bought in all: want one reel of its outside cable, the whole over %.0f m", c.Joins, c.ReelsM, c.LengthM, r.Plan.Design.ReelM)
			}
		}
	}
	if checked == 0 {
		t.Fatal("the demo has no feasible TWR-BRN leg with an entrance transition")
	}
}
