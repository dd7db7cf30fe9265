package routing

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/items"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// CableTakeoff is what one leg needs of its cable. Lengths are metres of one cable; a leg
// with more strands than the largest size has several cables side by side (Cables), of
// the same length.
type CableTakeoff struct {
	EndSlackM     float64 // service coils at both ends: 2 × design.slack_m
	EntranceLoopM float64 // slack loops at both building entrances
	// Passed is the maintenance holes and handholes the cable passes, each once, in travel
	// order from the served building (passesOf): the leg's one list of structures, which the
	// structures table and links.csv read. Structures counts them and AddedStructures those
	// of them the plan builds. Each gets a slack loop, a crew entry and pull set-up and the
	// bid items per structure passed, per cable.
	Passed          []SplicePoint
	Structures      int
	AddedStructures int
	StructureLoopM  float64 // slack loops at those structures
	// SpliceSlackM is the slack the mid-span joins add, each its SplicePoint.SlackM
	// (joinSlackM: design.splice_slack_m at each of the two cable ends a join makes, less the
	// slack loop a join in a structure passed stands for), coiled in the structure with the
	// closure.
	SpliceSlackM float64
	// ChannelM is route (laterals included) + risers + every slack loop and the splicing
	// slack: the length the loss budget counts.
	ChannelM float64
	WasteM   float64 // design.waste_pct of ChannelM
	LengthM  float64 // the length bought: ChannelM + WasteM rounded up to a whole metre; with joins the reels' cuts added up (ReelsM)
	Reels    int     // reels of at most design.reel_m that LengthM takes
	Joins    int     // mid-span splices between reels; each strand's path crosses every one
	// Splices are where the Joins go, in travel order from the served building (cut: the
	// fewest joins the reels allow, structures where that costs no join more, or the fewest
	// splice points to build where that costs less, fillLeg); ReelsM the
	// length cut from each reel, in metres (whole metres, with waste, the splicing slack at its
	// joined ends included), which sum to LengthM, or with an entrance transition to
	// OutsideLengthM: the joins are then placed and the reels cut over the outside-plant cable
	// only, the inside pieces being other cable. One reel without joins.
	Splices []SplicePoint
	ReelsM  []float64

	// Filled once the medium is chosen.
	// Cables is the cables of the chosen construction, largest first (media.Choice.Cables,
	// the engine's one decision of them, media.Engine.Cables).
	Cables media.Cables
	// Terminated is the strands terminated at each end; for copper, the 4-pair cables, one
	// per two strands (the catalog lists copper per 4-pair cable only: multipair backbone
	// cable of 25 to 600 pairs carries no IEEE 802.3 application it lists, so it is neither
	// priced nor chosen).
	Terminated int

	// With an entrance transition (Leg.Inside): the part of LengthM bought as the inside
	// construction, which runs inside the buildings of the transition's ends (InsideRunM,
	// with waste), in InsideCables (media.Choice.InsideCables); the rest of LengthM is the
	// outside-plant cable. Each inside cable is a piece at each end of the transition
	// (InsideEnds of them, Leg.InsideAt), cut to InsideToM at the served building (Link.To)
	// and InsideFromM at the cross-connect (Link.From), 0 at an end without; InsideLengthM is
	// their sum.
	InsideLengthM          float64
	InsideToM, InsideFromM float64
	InsideEnds             int
	// InsideRunM is the inside cable's run before waste: the cable inside the end buildings
	// the media engine spliced on (media.Choice.InsideM); 0 without a transition.
	InsideRunM   float64
	InsideCables media.Cables

	// What placing the joins again over the outside cable needs (cut): the structures
	// and spans along the channel, the served building, and the channel metres the inside
	// pieces take at each end before waste (0 over the whole cable).
	spans                      []spanOnChannel
	served                     string
	insideToChM, insideFromChM float64
}

// OutsideLengthM is the length bought of the leg's own construction: all of LengthM, or
// what the inside cable of a transition leaves.
func (t CableTakeoff) OutsideLengthM() float64 { return t.LengthM - t.InsideLengthM }

// CableEnds is the cable ends the leg's cables have, each prepared and labelled once: both
// ends of each outside cable, cut again at every mid-span splice (two ends more a join), and
// with an entrance transition both ends of each inside cable in each building of the
// transition (the transition enclosure splices the outside cable's end to one of them). Set
// once the medium is chosen (Fit).
func (t CableTakeoff) CableEnds() int {
	return 2*len(t.Cables)*(1+t.Joins) + t.InsideCableEnds()
}

// InsideCableEnds is the cable ends of an entrance transition's inside cables: both ends of
// each in each building of the transition, those media.TransitionEnds prepares; 0 without.
func (t CableTakeoff) InsideCableEnds() int { return 2 * len(t.InsideCables) * t.InsideEnds }

// Enclosures is the enclosures the leg's cables put in the field, each installed once: a
// transition enclosure per outside cable at each entrance of the transition (InsideEnds),
// and a splice closure per outside cable at each mid-span join. The buildings' fibre
// enclosures and panels are counted by building (estimate.Connectivity).
func (t CableTakeoff) Enclosures() int {
	return len(t.Cables)*t.Joins + t.TransitionEnclosures()
}

// TransitionEnclosures is the entrance transition enclosures of the leg: one per outside
// cable at each entrance of the transition; 0 without one.
func (t CableTakeoff) TransitionEnclosures() int { return len(t.Cables) * t.InsideEnds }

// SlackM is every slack loop of the leg and the splicing slack at its joins, in metres.
func (t CableTakeoff) SlackM() float64 {
	return t.EndSlackM + t.EntranceLoopM + t.StructureLoopM + t.SpliceSlackM
}

// beforeJoinsM is the channel without the splicing slack at the joins, in metres: what the
// structures passed and the spans are placed along (SplicePoint.ChannelM), and what placeJoins
// places the joins over.
func (t CableTakeoff) beforeJoinsM() float64 { return t.ChannelM - t.SpliceSlackM }

// joinSlackM is the slack, in metres, one mid-span join adds to a cable's channel beyond its
// slack loops at structures passed: the splicing slack of its two cable ends, 2 ×
// design.splice_slack_m (the join is made above ground, and the ends are coiled in the
// structure with the closure afterwards). A join in a structure the cable passes (inStructure)
// stores there the larger of that and the structure's slack loop
// (design.slack_loop_structure_m), once, not both: the cable does not pass through a
// structure it is joined in, it ends there twice, and the coiled ends are the slack stored
// there (a crew racks the splicing slack and leaves no loop beside it; common practice, no
// published source); the loop, counted with the structures passed, is the first metres of it.
// The one figure of a join's slack: the takeoff (setReels, placeJoins' reel cuts), the
// structures table (SplicePoint.SlackM) and, for joins by length, which may stand at a
// reel's end in no structure, the optimizer's reach (spliceSlackM).
func joinSlackM(d plan.Design, inStructure bool) float64 {
	ends := 2 * d.SpliceSlackM
	if !inStructure {
		return ends
	}
	return max(ends, d.SlackLoopStructureM) - d.SlackLoopStructureM
}

// spliceSlackM is the splicing slack, in metres, of a cable with joins mid-span joins counted
// by its length (reels, joinsUpToM, Model.reachWithJoinsM), none in a structure: joinSlackM
// each, an upper bound on what joins placed in structures take (setReels).
func spliceSlackM(d plan.Design, joins int) float64 { return float64(joins) * joinSlackM(d, false) }

// takeoff measures a routed leg's cable before its medium is known: slack loops, channel,
// waste and reels. The rule engine then decides on the channel and the reel joins (fed back
// as splices in the loss budget); Fit completes it with the chosen construction.
func takeoff(s *site.Site, d plan.Design, leg *Leg, built builtOn) CableTakeoff {
	t := CableTakeoff{EndSlackM: 2 * d.SlackM, EntranceLoopM: 2 * d.SlackLoopEntranceM}
	passes, spans := passesOf(s, d, leg, built)
	t.Passed = passes
	for _, p := range passes {
		t.Structures++
		if p.Added {
			t.AddedStructures++
		}
	}
	t.StructureLoopM = float64(t.Structures) * d.SlackLoopStructureM
	t.ChannelM = leg.RouteM + leg.RiserM + t.SlackM() // no joins yet: setReels adds their slack
	served := ""
	if leg.Link != nil {
		served = leg.Link.To
	}
	t.spans, t.served = spans, served
	return t.cut(d, 0, 0, false)
}

// setReels sets the takeoff's mid-span splices and reels (placeJoins' answer; one reel of the
// whole length without joins), the splicing slack of those joins in the channel and its waste,
// and returns the metres bought on the reels, added up.
func (t *CableTakeoff) setReels(d plan.Design, splices []SplicePoint, reelsM []float64) float64 {
	beforeM := t.beforeJoinsM()
	t.Splices, t.ReelsM = splices, reelsM
	t.Joins, t.Reels = len(splices), len(reelsM)
	t.SpliceSlackM = 0
	for i := range t.Splices {
		t.SpliceSlackM += t.Splices[i].SlackM
	}
	t.ChannelM = beforeM + t.SpliceSlackM
	t.WasteM = t.ChannelM * d.WastePct / 100
	var sum float64
	for _, m := range reelsM {
		sum += m
	}
	return sum
}

// cut is t with its mid-span joins placed and its reels cut over the cable between insideToChM
// metres of channel from the served building's end and insideFromChM metres before the other
// (the outside-plant cable between an entrance transition's splices; 0 and 0, the whole cable,
// without a transition: the inside pieces are other cable, cut from other reels), with the
// fewest joins the reels allow, or with fewerPoints the fewest splice points to build
// (placeJoins). It is the one placement of a leg's joins: the medium choice (fillLeg, which
// keeps the fewer splice points where they cost less), the loss budget, the cable schedule,
// the cut list and the bill read it, and the optimizer's reach counts the joins the same
// length takes (reels, joinsUpToM, over the outside cable of a transition laying,
// Model.reachWithJoinsM). Splices keep their places along the whole channel; ReelsM are the
// cable's between the two points, and LengthM their sum (Fit adds the inside pieces).
func (t CableTakeoff) cut(d plan.Design, insideToChM, insideFromChM float64, fewerPoints bool) CableTakeoff {
	beforeM := t.beforeJoinsM()
	startM := min(max(insideToChM, 0), beforeM)
	outM := max(beforeM-startM-max(insideFromChM, 0), 0)
	t.insideToChM, t.insideFromChM = startM, beforeM-startM-outM
	passes, spans := t.Passed, t.spans // the whole cable: as they are
	if startM > 0 || outM < beforeM {
		passes = nil
		for _, p := range t.Passed {
			if p.ChannelM > startM && p.ChannelM < startM+outM {
				p.ChannelM -= startM
				passes = append(passes, p)
			}
		}
		spans = make([]spanOnChannel, len(t.spans))
		for i, sc := range t.spans {
			sc.startM -= startM
			spans[i] = sc
		}
	}
	lengthM, _ := reels(d, outM)
	splices := placeJoins(d, passes, spans, outM, t.served, fewerPoints)
	reelsM := cutReels(d, splices, outM, lengthM)
	for i := range splices {
		splices[i].ChannelM += startM
	}
	t.LengthM = t.setReels(d, splices, reelsM)
	return t
}

// SplicePoints is the splice points to build among the takeoff's joins (NoStructure).
func (t CableTakeoff) SplicePoints() int {
	n := 0
	for _, p := range t.Splices {
		if p.NoStructure {
			n++
		}
	}
	return n
}

// SplicePoint is a place along a leg: a structure by its ID (a junction's, for a handhole the
// plan adds there: Added), or a handhole the plan adds along new construction on Span, AtM
// metres from its from end, named End (geo.Network.EndName). NoStructure marks a mid-span splice that no structure within
// reach of its reel could take: it is on Span at AtM, or, off the spans (in a riser, a slack
// loop or a lateral), ChannelM metres along the cable from building ID; a splice point (a
// handhole, or a closure on the strand of an aerial span) is to be built there.
type SplicePoint struct {
	ID          string
	Span        string
	AtM         float64
	End         string // Span's from end, which AtM counts from, as AlongText names it
	Added       bool
	NoStructure bool
	// AtReelEnd marks a NoStructure splice placed at its reel's end although a structure
	// before it could take it (placeJoins): there the leg would need a join more than its
	// length does.
	AtReelEnd bool
	// ChannelM is where it is along the channel, in metres from the served building's end of
	// the cable (its riser, coil and entrance loop first), the splicing slack at joins before
	// it not counted (CableTakeoff.beforeJoinsM): where the route puts it.
	ChannelM float64
	// SlackM is, for a join (CableTakeoff.Splices), the slack it adds to the channel
	// (joinSlackM: in a structure passed, what the splicing slack of its two cable ends adds
	// to the slack loop there), coiled there with the closure; 0 for a structure passed.
	SlackM float64
}

// BuildsHandhole reports whether p is a splice point to build that is a handhole dug in the
// ground: a join no structure takes (NoStructure) on a span that is not aerial. On an aerial
// span it is a closure on the strand, nothing dug; off the spans (in a riser, a slack loop or
// a lateral) it has no place of its own. The one answer the structures table, the excavation
// cautions and the crew's entries read.
func (p SplicePoint) BuildsHandhole(n *geo.Network) bool {
	sp, ok := n.Span(p.Span)
	return p.NoStructure && ok && sp.Type != geo.TypeAerial
}

// SplicePointCrew is the crew's work, per cable, at the cable's splice points to build (joins
// no structure takes): each is a pull point, where the next reel's pull starts, and one built
// as a handhole is entered to splice (tester 11's finding 5). The bill (estimate) and the
// price of a placement of joins (Model.joinsCents) read it. Common practice, no published source.
func (t CableTakeoff) SplicePointCrew(n *geo.Network) (pullPoints, entered float64) {
	for _, sp := range t.Splices {
		if sp.NoStructure {
			pullPoints++
		}
		if sp.BuildsHandhole(n) {
			entered++
		}
	}
	return pullPoints, entered
}

// Text is the place as a person reads it, with lengths written by length (the output's units).
func (p SplicePoint) Text(length func(m float64) string) string {
	switch {
	case p.NoStructure && p.Span != "":
		return "no structure: " + AlongText(p.Span, p.End, p.AtM, length)
	case p.NoStructure:
		return "no structure: " + length(p.ChannelM) + " along the cable from " + p.ID
	case p.ID == "":
		return "new handhole " + AlongText(p.Span, p.End, p.AtM, length)
	case p.Added:
		return p.ID + " (handhole to add)"
	}
	return p.ID
}

// AlongText is a place atM metres along span (or along a counted lateral, "lateral of" its
// entrance) from its end named end (geo.Network.EndName: a building, a structure, a junction),
// as a person reads it, with the length written by length: "on N-GRH, 150.0 m from the GRH
// end". Named so because a distance alone reads as a chainage from wherever the crew starts
// (tester 8 finding 9). The one text of such a place: a pull point (estimate.PullPoint.Text),
// a splice point and a handhole along new construction (SplicePoint.Text), the structures
// table's rows. Without an end (a point assembled by hand): "on SPAN at LENGTH".
func AlongText(span, end string, atM float64, length func(m float64) string) string {
	if end == "" {
		return "on " + span + " at " + length(atM)
	}
	return "on " + span + ", " + length(atM) + " from the " + end + " end"
}

// builtOn is where the plan builds handholes, which the legs' structure lists (passesOf)
// read: at junctions (Routed.Handholes, by junction ID, whatever their reasons) and along the
// runs of new construction (by span ID, metres from the span's from end: site.NewRun's
// handholes).
type builtOn struct {
	at    map[string]bool
	along map[string][]float64
}

// passesOf lists the maintenance holes and handholes a leg's cable passes, in travel order
// from the served building, each once, with where it is along the channel: the campus's own
// at the junctions of its route, its ends included (items.Entered), and the handholes the
// plan builds (Added) at the junctions of its route (built.at, and where its own laterals tap
// a duct) and along the runs of new construction on its spans (built.along). It is the leg's
// one list of structures: the slack loops, the crew's entries and pull set-ups, the bid items
// per structure passed, the structures table's legs and links.csv's structures_passed all
// read it.
//
// A handhole built at a junction is built into the duct runs that meet there (the ducts are
// broken out into it, as at a maintenance hole on a run), so every leg whose route passes the
// junction passes through it and leaves its one slack loop there, whether it turns, joins
// new pathway, taps by a lateral or runs straight on (README, "Structures passed"); but a
// leg that only passes the junction on aerial spans, in the strand overhead, does not (common
// practice, no published source). A handhole the pulling plan adds for a pull over its limits
// (estimate.PullSection.AddedFrom) is not among them: it is placed once the cable is chosen,
// after this list, and holds no slack loop. Each pass leaves a slack loop of
// design.slack_loop_structure_m, counted on the channel where it is.
func passesOf(s *site.Site, d plan.Design, leg *Leg, built builtOn) ([]SplicePoint, []spanOnChannel) {
	var out []SplicePoint
	var spans []spanOnChannel
	at := 0.0
	pass := func(p SplicePoint) {
		at += d.SlackLoopStructureM
		p.ChannelM = at
		out = append(out, p)
	}
	to, from := "", ""
	if leg.Link != nil {
		to, from = leg.Link.To, leg.Link.From
	}
	entry, _ := s.Net.Entry(to, leg.EntranceTo)
	far, _ := s.Net.Entry(from, leg.EntranceFrom)
	// The handholes where the leg's own laterals tap a duct are built whenever the leg is
	// (handholesOf: the taps of the entrances used), so it is measured with them whatever
	// built.at says: a leg whose loss budget or reach fails with its tap's slack loop is
	// infeasible, not feasible in a round that left its tap out (SolveFrom's rounds).
	tapTo, tapFrom := tapOf(s, entry), tapOf(s, far)
	ownTap := func(j string) bool { return j != "" && (j == tapTo || j == tapFrom) }
	at = s.RiserM(to) + d.SlackM + d.SlackLoopEntranceM + entry.LateralM
	// A lateral that leaves a pole line comes up the pole from the handhole at its foot (its
	// tap, the first junction) to the strand; the far end's comes down before its last.
	poleTo, poleFrom := items.PoleRiserM(d, entry.LateralM, entry.PoleRiser), items.PoleRiserM(d, far.LateralM, far.PoleRiser)
	juncs := s.JunctionsOf(leg.Steps)
	atJunction := func(k int) {
		j := juncs[k]
		switch {
		case items.Entered(s, j):
			pass(SplicePoint{ID: j})
		case (built.at[j] || ownTap(j)) && throughHandhole(s, leg, juncs, k):
			pass(SplicePoint{ID: j, Added: true})
		}
	}
	for k, st := range leg.Steps {
		atJunction(k)
		if k == 0 {
			at += poleTo
		}
		sp, _ := s.Net.Span(st.SpanID)
		offs := slices.Clone(built.along[st.SpanID]) // metres from the span's from end
		slices.Sort(offs)
		if st.Reverse {
			slices.Reverse(offs)
		}
		hh := make([]float64, len(offs)) // metres into the span in travel order
		for i, m := range offs {
			if st.Reverse {
				m = sp.LengthM - m
			}
			hh[i] = m
		}
		start, fromEnd := at, s.Net.EndName(sp.From)
		spans = append(spans, spanOnChannel{span: &sp, fromEnd: fromEnd, reverse: st.Reverse, startM: start, loopsAt: hh})
		for i, m := range hh {
			at = start + m + float64(i)*d.SlackLoopStructureM
			pass(SplicePoint{Span: sp.ID, AtM: offs[i], End: fromEnd, Added: true})
		}
		at = start + sp.LengthM + float64(len(hh))*d.SlackLoopStructureM
	}
	if len(juncs) > 0 {
		at += poleFrom
		atJunction(len(juncs) - 1)
	}
	return out, spans
}

// throughHandhole reports whether the leg's cable goes through a handhole built at juncs[k]
// (passesOf): unless it only passes there on aerial spans, overhead, with no lateral of its
// own tapping there, no turn there and no new span of its own joining the network there.
func throughHandhole(s *site.Site, leg *Leg, juncs []string, k int) bool {
	if k == 0 || k == len(juncs)-1 || slices.Contains(leg.Turns, juncs[k]) {
		return true // a leg's end: its lateral taps there, or it ends in the handhole
	}
	for _, q := range []int{k - 1, k} { // the spans ending and starting here
		sp, ok := s.Net.Span(leg.Steps[q].SpanID)
		if ok && (sp.Type != geo.TypeAerial || (sp.Status == geo.StatusProposed && s.JoinsNetwork(juncs[k]))) {
			return true
		}
	}
	return false
}

// Passes reports whether the takeoff's structures passed hold the one at junction j (by its ID).
func (t CableTakeoff) Passes(j string) bool {
	return slices.ContainsFunc(t.Passed, func(p SplicePoint) bool { return p.ID == j && p.Span == "" })
}

// spanOnChannel is a span of a leg's route where it lies along the channel: from startM, in
// travel order, with the slack loops of the handholes along it at loopsAt (metres into it in
// travel order); fromEnd names its from end (geo.Network.EndName).
type spanOnChannel struct {
	span    *geo.Span
	fromEnd string
	reverse bool
	startM  float64
	loopsAt []float64
}

// locate finds channel position atM on the spans: the span, metres from its from end and that
// end's name; false off the spans (a riser, coil, lateral or slack loop).
func locate(spans []spanOnChannel, loopM, atM float64) (string, float64, string, bool) {
	for _, sc := range spans {
		into := atM - sc.startM
		for _, h := range sc.loopsAt {
			if into > h+loopM {
				into -= loopM
			} else if into > h {
				return "", 0, "", false // in that handhole's loop
			}
		}
		if into < 0 || into > sc.span.LengthM {
			continue
		}
		if sc.reverse {
			into = sc.span.LengthM - into
		}
		return sc.span.ID, into, sc.fromEnd, true
	}
	return "", 0, "", false
}

// placeJoins places the mid-span splices of a channel channelM metres long (before the
// splicing slack of its joins, CableTakeoff.beforeJoinsM) whose structures passed are passes
// (passesOf, in travel order, ChannelM along this channel). A reel of design.reel_m carries
// reel_m / (1 + waste_pct/100) metres of channel (the waste spread over its length), the
// splicing slack at its joined ends included (design.splice_slack_m each: a reel between two
// joins carries twice that less of the route), or its whole length when carried on to a
// structure just beyond that on its waste (the piece cut to the whole reel: a crew carries the
// reel on to a structure rather than build a splice point a few metres short of it; common
// practice, no published source). A join goes in a structure passed (a splice closure is
// stored in a maintenance hole or handhole with its slack: TIA-758-B, from memory) or, where
// none serves, at its reel's end (NoStructure: a splice point to build, on its span, or off the
// spans by its distance along the cable from the served building; AtReelEnd when a structure
// within that reel's reach was passed over).
//
// With fewerPoints false it takes the fewest joins the reels allow, and among placements
// with that many the fewest splice points to build: without structures as many joins as
// reels(channelM) by length, at the reels' ends. With fewerPoints true the fewest splice
// points to build, and among placements with that many the fewest joins, which can be more
// than the length alone takes where structures are far apart. Either way a join is never put
// a few metres after a splice point in a structure the reel could have been carried past
// (review 14 F6), nor in a structure near the building when the next reel would still need a
// splice point that one join farther on does without (tester 11 F4). Ties go to the placement
// whose last join is farthest on. Common practice, no published source.
//
// It works by joins: the places a cable with k joins can have its k-th join, each with the
// fewest splice points to get there, a place kept only when no place farther on needs as few
// (from farther on a reel never reaches less far); the first k from whose places the last
// reel reaches the end wins (fewest joins), or the k whose finish needs the fewest splice
// points, once no place left can do with fewer (fewer points).
func placeJoins(d plan.Design, passes []SplicePoint, spans []spanOnChannel, channelM float64, served string, fewerPoints bool) []SplicePoint {
	if d.ReelM <= 0 {
		return nil
	}
	capM := reelCarriesM(d)
	slackM := d.SpliceSlackM
	overM := d.ReelM - capM // a reel's waste
	type place struct {
		atM     float64
		pass    int  // index into passes, -1 for a splice point to build
		passed  bool // a splice point with a structure within its reel's reach passed over
		points  int  // splice points to build up to and including this one
		parent  int  // index into places, -1 for the cable's start
		isStart bool
	}
	places := []place{{isStart: true, pass: -1, parent: -1}}
	layer := []int{0}
	headOf := func(p place) float64 {
		if p.isStart {
			return 0
		}
		return slackM
	}
	path := func(last int) []SplicePoint {
		var out []SplicePoint
		for i := last; !places[i].isStart; i = places[i].parent {
			p := places[i]
			sp := SplicePoint{ID: served, NoStructure: true, AtReelEnd: p.passed, ChannelM: p.atM}
			if p.pass >= 0 {
				sp = passes[p.pass]
			} else if id, m, end, ok := locate(spans, d.SlackLoopStructureM, p.atM); ok {
				sp.Span, sp.AtM, sp.End = id, m, end
			}
			sp.SlackM = joinSlackM(d, !sp.NoStructure)
			out = append(out, sp)
		}
		slices.Reverse(out)
		return out
	}
	done := -1 // the best finish so far (fewerPoints)
	for len(layer) > 0 {
		best, least := -1, math.MaxInt
		for _, i := range layer {
			p := places[i]
			least = min(least, p.points)
			if channelM-p.atM+headOf(p) <= capM+1e-9 && (best < 0 || p.points < places[best].points || p.points == places[best].points && p.atM > places[best].atM) {
				best = i
			}
		}
		if best >= 0 && (done < 0 || places[best].points < places[done].points) {
			done = best
		}
		if done >= 0 && (!fewerPoints || places[done].points <= least) {
			return path(done)
		}
		// The next join's places from each of this layer's: every structure its reel reaches
		// (on its waste too), and its reel's end.
		var next []place
		for _, i := range layer {
			p := places[i]
			endM := p.atM + capM - headOf(p) - slackM
			within := false
			for j := range passes {
				at := passes[j].ChannelM
				if at <= p.atM+1e-9 || at > endM+overM+1e-9 {
					continue
				}
				within = within || at <= endM+1e-9
				next = append(next, place{atM: at, pass: j, points: p.points, parent: i})
			}
			next = append(next, place{atM: endM, pass: -1, passed: within, points: p.points + 1, parent: i})
		}
		// Keep, farthest first, a place only when it needs fewer splice points than every
		// place farther on (ties: a structure before a splice point, then the farthest parent).
		slices.SortStableFunc(next, func(a, b place) int {
			switch {
			case a.atM != b.atM:
				return cmp.Compare(b.atM, a.atM)
			case a.points != b.points:
				return a.points - b.points
			case a.pass != b.pass:
				return b.pass - a.pass
			}
			return cmp.Compare(places[b.parent].atM, places[a.parent].atM)
		})
		layer = layer[:0]
		fewest := math.MaxInt
		for _, p := range next {
			if p.points < fewest {
				fewest = p.points
				places = append(places, p)
				layer = append(layer, len(places)-1)
			}
		}
	}
	return nil
}

// cutReels cuts the reels of a channel channelM metres long (before the splicing slack of its
// joins) joined at splices: each piece between two joins with the splicing slack of its joined
// ends and the design's waste, up to a whole metre, at most design.reel_m (a piece carried on
// to a structure on its reel's waste is cut to the whole reel); without joins the one reel is
// lengthM.
func cutReels(d plan.Design, splices []SplicePoint, channelM, lengthM float64) (reelsM []float64) {
	if len(splices) == 0 {
		return []float64{lengthM}
	}
	slackM := d.SpliceSlackM
	prev, headM := 0.0, 0.0
	for i, p := range append(slices.Clone(splices), SplicePoint{ChannelM: channelM}) {
		// A reel starts with the splicing slack of its joined head end and ends with what its
		// join adds besides (joinSlackM: in a structure, the loop there, which is in the
		// channel up to p, is the first metres of the tail); the last reel ends at the cable's end.
		pieceM := p.ChannelM - prev + headM
		if i < len(splices) {
			pieceM += p.SlackM - slackM
		}
		cutM := math.Ceil(pieceM*(1+d.WastePct/100) - 1e-9)
		if cutM > d.ReelM { // carried on to a structure on its waste
			cutM = max(math.Floor(d.ReelM+1e-9), math.Ceil(pieceM-1e-9))
		}
		reelsM = append(reelsM, cutM)
		prev, headM = p.ChannelM, slackM
	}
	return reelsM
}

// reelCarriesM is the channel a reel of design.reel_m carries, in metres: reel_m / (1 +
// waste_pct/100), the splicing slack at its joined ends included. It panics when that is no
// more than the splicing slack at a reel's two ends (plan validation refuses such a design), for
// then no number of reels reaches.
func reelCarriesM(d plan.Design) float64 {
	capM := d.ReelM / (1 + d.WastePct/100)
	if 2*d.SpliceSlackM >= capM {
		panic(fmt.Sprintf("routing: a reel of %g m carries %g m of channel, no more than the splicing slack at its two ends (2 × %g m)", d.ReelM, capM, d.SpliceSlackM))
	}
	return capM
}

// reels is the cable bought for a channel of channelM metres in one reel (with the design's
// waste, rounded up to a whole metre) and the reels of at most design.reel_m it takes by length
// alone, each join adding its splicing slack (spliceSlackM): the mid-span splices (reels − 1)
// the optimizer's reach counts for a channel that long (Model.reachM). A routed leg's joins are
// placed with as many (placeJoins with the fewest joins: TestJoinsByLengthWithSlack), or fewer
// where a reel carried on to a structure on its waste spares one; the fewest splice points to
// build can take more where structures are far apart, which fillLeg keeps only where that costs
// less and the loss budget closes.
func reels(d plan.Design, channelM float64) (lengthM float64, n int) {
	lengthM = math.Ceil(channelM + channelM*d.WastePct/100 - 1e-9)
	n = 1
	if d.ReelM > 0 { // a plan built in code may leave it 0: no reel limit
		reelCarriesM(d) // each reel more takes less splicing slack than it carries, so this ends
		n = max(1, int(math.Ceil(lengthM/d.ReelM-1e-9)))
		// Each reel more carries reel_m less its joins' splicing slack with waste: at least
		// (channel − J)(1 + w) / (reel_m − J(1 + w)) reels (J a join's slack), which the steps
		// below start just short of, so that a reel carrying little besides its slack takes a
		// step or two, not one per reel (review 15 F5: reel_m 100 with 47.6 m of slack an end
		// spent minutes here).
		w := 1 + d.WastePct/100
		if j := spliceSlackM(d, 1); d.ReelM > j*w {
			n = max(n, int(math.Floor((channelM-j)*w/(d.ReelM-j*w)))-1)
		}
		for math.Ceil((channelM+spliceSlackM(d, n-1))*(1+d.WastePct/100)-1e-9) > float64(n)*d.ReelM+1e-9 {
			n++
		}
	}
	return lengthM, n
}

// joinsUpToM is the longest channel, in metres, whose cable takes at most joins mid-span
// splices (reels), their splicing slack not counted (CableTakeoff.beforeJoinsM); +Inf without
// a reel limit.
func joinsUpToM(d plan.Design, joins int) float64 {
	if d.ReelM <= 0 {
		return math.Inf(1)
	}
	// The length bought is whole metres: at most (joins+1) reels of reel_m, the joins' splicing
	// slack among them.
	boughtM := math.Floor(float64(joins+1)*d.ReelM + 1e-9)
	x := boughtM/(1+d.WastePct/100) - spliceSlackM(d, joins)
	for i := 0; i < 64; i++ { // the float division may land a hair above: step down to the last length that fits
		if _, n := reels(d, x); n <= joins+1 {
			break
		}
		x = math.Nextafter(x, 0) - 1e-9*x
	}
	return x
}

// Fit fills the takeoff's cable size from the rule engine's choice; with an entrance
// transition, also the inside cable, which takes what the engine laid inside the buildings
// of the transition's ends (media.Choice.InsideAM and InsideBM: riser, service coil,
// entrance loop, in-building trays; A is the served building, Link.To, B the cross-connect's,
// Link.From, as fillLeg gives the link's ends): at each such end a piece of that end's share,
// with the design's waste, cut to a whole metre, as a crew cuts each piece from its reel.
func (t *CableTakeoff) Fit(ch media.Choice, wastePct float64) {
	t.Cables = ch.Cables
	t.Terminated = ch.Strands
	if ch.Inside != "" {
		t.InsideCables = ch.InsideCables
		t.InsideRunM, t.InsideEnds = ch.InsideM, ch.InsideAt.Count()
		piece := func(m float64) float64 { return math.Ceil(m*(1+wastePct/100) - 1e-9) }
		wholeM := piece(t.ChannelM) // the whole cable in one length
		t.InsideToM = math.Min(wholeM, piece(ch.InsideAM))
		t.InsideFromM = math.Min(wholeM-t.InsideToM, piece(ch.InsideBM))
		t.InsideLengthM = t.InsideToM + t.InsideFromM
		if t.Joins == 0 { // one outside reel: what the inside pieces leave of the whole length
			t.ReelsM = []float64{wholeM - t.InsideLengthM}
		}
	}
	t.LengthM = t.InsideLengthM
	for _, m := range t.ReelsM {
		t.LengthM += m
	}
}
