package routing

import (
	"math"

	"spanwright/media"
	"spanwright/route/items"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// CableTakeoff is what one leg needs of its cable. Lengths are metres of one cable; a leg
// with more strands than the largest size has Cables of them side by side.
type CableTakeoff struct {
	EndSlackM     float64 // service coils at both ends: 2 × design.slack_m
	EntranceLoopM float64 // slack loops at both building entrances
	// Structures is the maintenance holes and handholes the cable passes (PassedBy): those
	// of the campus and, of them, AddedStructures the handholes the plan builds. Each gets a
	// slack loop, a crew entry and the bid items per structure passed, per cable.
	Structures      int
	AddedStructures int
	StructureLoopM  float64 // slack loops at those structures
	// ChannelM is route (laterals included) + risers + every slack loop: the length the loss
	// budget counts.
	ChannelM float64
	WasteM   float64 // design.waste_pct of ChannelM
	LengthM  float64 // the length bought: ChannelM + WasteM rounded up to a whole metre
	Reels    int     // reels of at most design.reel_m that LengthM takes
	Joins    int     // mid-span splices between reels; each strand's path crosses every one

	// Filled once the medium is chosen.
	Size   media.Size // the cable size of the chosen construction
	Cables int        // cables of Size
	// Terminated is the strands terminated at each end; for copper, the 4-pair cables, one
	// per two strands (the catalog lists copper per 4-pair cable only: multipair backbone
	// cable of 25 to 600 pairs carries no IEEE 802.3 application it lists, so it is neither
	// priced nor chosen).
	Terminated int

	// With an entrance transition (Leg.Inside): the part of LengthM bought as the inside
	// construction, which runs the risers and the service coils at both ends (with waste),
	// in InsideCables cables of InsideSize; the rest of LengthM is the outside-plant cable.
	InsideLengthM float64
	InsideSize    media.Size
	InsideCables  int
}

// OutsideLengthM is the length bought of the leg's own construction: all of LengthM, or
// what the inside cable of a transition leaves.
func (t CableTakeoff) OutsideLengthM() float64 { return t.LengthM - t.InsideLengthM }

// CableEnds is the cable ends the leg's cables have, each prepared and labelled once: both
// ends of each outside cable, cut again at every mid-span splice (two ends more a join), and
// with an entrance transition both ends of each inside cable at each end's building (the
// transition enclosure splices the outside cable's end to one of them). Set once the medium
// is chosen (Fit).
func (t CableTakeoff) CableEnds() int {
	return 2*t.Cables*(1+t.Joins) + 4*t.InsideCables
}

// Enclosures is the enclosures the leg's cables put in the field, each installed once: a
// transition enclosure per outside cable at each entrance, and a splice closure per outside
// cable at each mid-span join. The buildings' fibre enclosures and panels are counted by
// building (estimate.Connectivity).
func (t CableTakeoff) Enclosures(transition bool) int {
	n := t.Cables * t.Joins
	if transition {
		n += 2 * t.Cables
	}
	return n
}

// SlackM is every slack loop of the leg, in metres.
func (t CableTakeoff) SlackM() float64 { return t.EndSlackM + t.EntranceLoopM + t.StructureLoopM }

// takeoff measures a routed leg's cable before its medium is known: slack loops, channel,
// waste and reels. The rule engine then decides on the channel and the reel joins (fed back
// as splices in the loss budget); Fit completes it with the chosen construction.
func takeoff(s *site.Site, d plan.Design, leg *Leg, runHH map[string]int) CableTakeoff {
	t := CableTakeoff{EndSlackM: 2 * d.SlackM, EntranceLoopM: 2 * d.SlackLoopEntranceM}
	t.Structures, t.AddedStructures = PassedBy(s, leg, runHH)
	t.StructureLoopM = float64(t.Structures) * d.SlackLoopStructureM
	t.ChannelM = leg.RouteM + leg.RiserM + t.SlackM()
	t.WasteM = t.ChannelM * d.WastePct / 100
	t.LengthM, t.Reels = reels(d, t.ChannelM)
	t.Joins = t.Reels - 1
	return t
}

// PassedBy counts the maintenance holes and handholes a leg's cable passes, the one count
// of them that its slack loops, channel, cable bought, reels, crew entries and bid items
// per structure passed all use: the campus's own at the junctions of its route, its ends
// included (site.Site.LoopStructure), and the handholes the plan builds on its way (added):
// where it turns between pathways (Leg.Turns), where a lateral at either end taps a duct
// (site.Site.LegTaps), along the runs of new construction on its spans (runHH, by span ID:
// site.NewRun's handholes) and where its new pathway joins the network (items.JoinEnds,
// which counts a route from one new span into another at such a junction twice, as the
// optimizer does). A handhole the pulling plan adds for a pull over its limits
// (estimate.PullSection.AddedFrom) is not among them: it is placed once the cable is
// chosen, after this count.
func PassedBy(s *site.Site, leg *Leg, runHH map[string]int) (all, added int) {
	for _, j := range s.JunctionsOf(leg.Steps) {
		if items.Entered(s, j) {
			all++
		}
	}
	added = len(leg.Turns)
	if leg.Link != nil {
		added += len(s.LegTaps(leg.Link.To, leg.EntranceTo, leg.Link.From, leg.EntranceFrom))
	}
	joins := 0.0 // whole ends, as a float (items.JoinEnds)
	for _, st := range leg.Steps {
		sp, _ := s.Net.Span(st.SpanID)
		added += runHH[st.SpanID]
		joins += items.JoinEnds(s, &sp)
	}
	added += int(joins)
	return all + added, added
}

// reels is the cable bought for a channel of channelM metres (with the design's waste,
// rounded up to a whole metre) and the reels of at most design.reel_m it takes: the one
// decision of how many mid-span splices (reels − 1) a channel that long gets, for the takeoff
// and for the reach the optimizer keeps a route within (Model.reachM).
func reels(d plan.Design, channelM float64) (lengthM float64, n int) {
	lengthM = math.Ceil(channelM + channelM*d.WastePct/100 - 1e-9)
	n = 1
	if d.ReelM > 0 { // a plan built in code may leave it 0: no reel limit
		n = max(1, int(math.Ceil(lengthM/d.ReelM-1e-9)))
	}
	return lengthM, n
}

// joinsUpToM is the longest channel, in metres, whose cable takes at most joins mid-span
// splices (reels); +Inf without a reel limit.
func joinsUpToM(d plan.Design, joins int) float64 {
	if d.ReelM <= 0 {
		return math.Inf(1)
	}
	// The length bought is whole metres: at most (joins+1) reels of reel_m.
	boughtM := math.Floor(float64(joins+1)*d.ReelM + 1e-9)
	x := boughtM / (1 + d.WastePct/100)
	for i := 0; i < 64; i++ { // the float division may land a hair above: step down to the last length that fits
		if _, n := reels(d, x); n <= joins+1 {
			break
		}
		x = math.Nextafter(x, 0) - 1e-9*x
	}
	return x
}

// Fit fills the takeoff's cable size from the rule engine's choice; with an entrance
// transition, also the inside cable, which takes riserM and the service coils, with the
// design's waste.
func (t *CableTakeoff) Fit(cat *media.Catalog, ch media.Choice, riserM, wastePct float64) {
	m := cat.Medium(ch.Medium)
	t.Size, t.Cables = m.Construction(ch.Construction).Fit(ch.Strands)
	t.Terminated = ch.Strands
	if ch.Inside != "" {
		t.InsideSize, t.InsideCables = m.Construction(ch.Inside).Fit(ch.Strands)
		t.InsideLengthM = math.Min(t.LengthM, math.Ceil((riserM+t.EndSlackM)*(1+wastePct/100)-1e-9))
	}
}
