package install

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// DefaultMaxBendDeg is the bend budget between pull points, in degrees, used when
// PullSpec.MaxBendDeg is 0: TIA-569 allows no more than two 90° bends between pull points
// (seen). NFPA 70 allows 360° per raceway; set MaxBendDeg to 360 for that.
const DefaultMaxBendDeg = 180.0

// MaxPiecesPerStep bounds how many parts Sections may cut one straight into; a straight that
// would need more is left whole and its section flagged.
const MaxPiecesPerStep = 512

// bendTolDeg absorbs rounding when bend angles are summed.
const bendTolDeg = 1e-9

// PullSpec is the cable and duct data for planning pulls with Sections.
type PullSpec struct {
	WNPerM       float64 // cable weight per metre, N/m, >= 0
	Mu           float64 // coefficient of friction between cable and duct, >= 0
	TInN         float64 // back tension at the feed end of every section, N, >= 0 and < MaxTensionN
	MaxTensionN  float64 // the cable's rated maximum pulling tension, N, > 0
	MaxBendDeg   float64 // most bend degrees between pull points; 0 means DefaultMaxBendDeg
	MaxLengthM   float64 // most metres between pull points; 0 means no limit
	MaxSWBPNPerM float64 // most sidewall bearing pressure at a bend, N/m; 0 means not checked
}

// Section is one pull between two pull points.
type Section struct {
	Span    int     // 0-based index of the stretch between given pull points that holds it
	StartM  float64 // distance along the run from its first step to the section's start, m
	LengthM float64 // sum of the steps' LengthM, m
	BendDeg float64 // sum of the bends' AngleDeg, degrees

	// Steps are the section's steps in run order; a straight cut by an added pull point
	// appears as its part.
	Steps []Step

	Forward, Reverse Result // the pull from each end, as PullBothWays
	// Best is the direction to pull: the one within rating (tension and, when checked,
	// sidewall pressure) if only one is, otherwise the one with the lower MaxTensionN
	// (Forward on a tie), as PullBothWays chooses.
	Best         string
	MaxTensionN  float64 // MaxTensionN of the Best pull, N
	MaxSWBPNPerM float64 // MaxSWBPNPerM of the Best pull, N/m

	WithinRating bool // tension, bends, length and sidewall pressure all within the PullSpec
	// Over lists the limits of the PullSpec the section goes over (why not WithinRating),
	// as numbers; empty when it is within rating. Reason writes them in metric units.
	Over []Excess

	StartAdded bool // the pull point at StartM was added by Sections
	EndAdded   bool // the pull point at the section's end was added by Sections
}

// Plan is the pulling plan of one run.
type Plan struct {
	Sections        []Section // in run order
	AddedPullPoints int       // pull points Sections added, beyond run ends and given ones
	AddedAtM        []float64 // where they are, m along the run, ascending
	WithinRating    bool      // every section is within rating
}

// Sections splits a run into pull sections and plans each pull. pullPoints lists the step
// boundaries where the run passes a structure (maintenance hole, handhole, pull box): boundary
// b lies between steps[b-1] and steps[b]; they must be strictly ascending within
// [0, len(steps)], and 0 and len(steps), the run's ends, are pull points anyway.
//
// Each stretch between given pull points that is not within the spec gets intermediate pull
// points. Policy:
//   - A straight that cannot be pulled within the spec even on its own, from either end, is
//     first cut into the fewest equal parts that can (at most MaxPiecesPerStep).
//   - Pull points then go on step boundaries (and those cuts), chosen to use the fewest added
//     pull points; among those, the ones that make the highest pulling tension of any section
//     lowest (exact, by dynamic programming over the boundaries). Remaining ties are broken
//     deterministically: the last section starts as early as it can, and the stretch before
//     it is planned the same way on its own.
//   - A step that no pull point can bring within the spec (a single bend over the bend budget,
//     over the tension rating or over the sidewall limit, or a straight needing more than
//     MaxPiecesPerStep parts) becomes a section of its own, flagged not WithinRating with its
//     Reason; the run cannot be built as drawn and the caller should reroute.
//
// Sections returns an ErrorList of *InputError (wrapping ErrBadInput) naming every invalid
// step, pull point and spec field, and never panics. Time O(n²·m) per stretch of n steps and
// cuts in the worst case (inclined straights), O(n·m) with m steps per section on level runs.
func Sections(steps []Step, pullPoints []int, spec PullSpec) (Plan, error) {
	return sections(steps, pullPoints, spec, nil)
}

// sections is Sections, with the plans of the stretches between given pull points taken from
// m when it remembers them (nil m: none). A stretch's plan depends only on its steps and the
// spec, so runs that share a stretch (the legs of a campus share their trunk ducts) plan it
// once; only where the stretch lies along the run, its sections' Span and StartM, is the run's
// own, and it is set here with the arithmetic Sections has always used.
func sections(steps []Step, pullPoints []int, spec PullSpec, m *Memo) (Plan, error) {
	if err := spec.validate(steps, pullPoints); err != nil {
		return Plan{}, err
	}
	if spec.MaxBendDeg == 0 {
		spec.MaxBendDeg = DefaultMaxBendDeg
	}
	bounds := []int{0}
	for _, b := range pullPoints {
		if b > 0 && b < len(steps) {
			bounds = append(bounds, b)
		}
	}
	bounds = append(bounds, len(steps))

	plan := Plan{WithinRating: true}
	startM := 0.0 // where the stretch's next step starts along the run
	for span := 0; span+1 < len(bounds) && len(steps) > 0; span++ {
		stretch := steps[bounds[span]:bounds[span+1]]
		var planned []stretchSection
		if m != nil {
			planned = m.stretch(stretch, spec)
		} else {
			planned = spec.stretch(stretch)
		}
		origin := 0
		for k, ss := range planned {
			for ; origin < ss.origin; origin++ {
				startM += stretch[origin].LengthM
			}
			sec := ss.sec
			sec.Span, sec.StartM = span, startM
			if ss.parts > 1 {
				sec.StartM = startM + float64(ss.part)*(stretch[origin].LengthM/float64(ss.parts)) // as cut places its parts
			}
			if k > 0 {
				plan.AddedPullPoints++
				plan.AddedAtM = append(plan.AddedAtM, sec.StartM)
			}
			plan.WithinRating = plan.WithinRating && sec.WithinRating
			plan.Sections = append(plan.Sections, sec)
		}
		for ; origin < len(stretch); origin++ {
			startM += stretch[origin].LengthM
		}
	}
	return plan, nil
}

// stretchSection is a section of a stretch between given pull points, planned on its own:
// sec without its Span and StartM, and the piece it starts with (step origin of the stretch,
// part part of parts), from which sections places it along the run.
type stretchSection struct {
	sec                 Section
	origin, part, parts int
}

// stretch plans one stretch between given pull points (validated, MaxBendDeg set): its
// straights cut as cut does and its sections chosen by partition.
func (sp PullSpec) stretch(steps []Step) []stretchSection {
	var pcs []piece
	for i, s := range steps {
		pcs = append(pcs, sp.cut(s, i, 0)...)
	}
	secs, first := sp.partition(pcs)
	out := make([]stretchSection, len(secs))
	for k, sec := range secs {
		p := pcs[first[k]]
		out[k] = stretchSection{sec: sec, origin: p.origin, part: p.part, parts: p.parts}
	}
	return out
}

func (sp PullSpec) validate(steps []Step, pullPoints []int) error {
	var errs ErrorList
	errs.checkNonNeg("", 0, "WNPerM", sp.WNPerM)
	errs.checkNonNeg("", 0, "Mu", sp.Mu)
	errs.checkNonNeg("", 0, "TInN", sp.TInN)
	errs.checkPos("", 0, "MaxTensionN", sp.MaxTensionN)
	if finite(sp.TInN) && finite(sp.MaxTensionN) && sp.MaxTensionN > 0 && sp.TInN >= sp.MaxTensionN {
		errs = append(errs, &InputError{Field: "TInN", Got: fmtNum(sp.TInN), Want: "< MaxTensionN " + fmtNum(sp.MaxTensionN)})
	}
	errs.checkNonNeg("", 0, "MaxBendDeg", sp.MaxBendDeg)
	errs.checkNonNeg("", 0, "MaxLengthM", sp.MaxLengthM)
	errs.checkNonNeg("", 0, "MaxSWBPNPerM", sp.MaxSWBPNPerM)
	prev := -1
	for i, b := range pullPoints {
		switch {
		case b < 0 || b > len(steps):
			errs = append(errs, &InputError{Item: "pull point", Index: i, Field: "boundary", Got: fmt.Sprint(b), Want: fmt.Sprintf("in [0, %d]", len(steps))})
		case b <= prev:
			errs = append(errs, &InputError{Item: "pull point", Index: i, Field: "boundary", Got: fmt.Sprint(b), Want: fmt.Sprintf("> %d (strictly ascending)", prev)})
		}
		prev = max(prev, b)
	}
	errs.checkSteps(steps)
	return errs.Err()
}

// piece is a step, or an equal part of a straight cut by cut.
type piece struct {
	step   Step // the original step
	origin int  // its index in the run
	part   int  // 0-based part number
	parts  int  // number of parts the step was cut into, >= 1
	startM float64
}

// cut returns the step as one piece, or, for a straight that is not within the spec on its
// own, as the fewest equal parts that are.
func (sp PullSpec) cut(s Step, origin int, startM float64) []piece {
	whole := []piece{{step: s, origin: origin, parts: 1, startM: startM}}
	if s.Kind != KindStraight || s.LengthM == 0 || sp.evaluate(whole).WithinRating {
		return whole
	}
	partMaxM := math.Inf(1)
	if sp.MaxLengthM > 0 {
		partMaxM = sp.MaxLengthM
	}
	phi := s.InclineDeg * math.Pi / 180
	// Tension gained per metre when pulled from the better end.
	if rate := sp.WNPerM * (sp.Mu*math.Cos(phi) - math.Abs(math.Sin(phi))); rate > 0 {
		partMaxM = math.Min(partMaxM, (sp.MaxTensionN-sp.TInN)/rate)
	}
	for m := max(2, int(math.Min(math.Ceil(s.LengthM/partMaxM), MaxPiecesPerStep+1))); m <= MaxPiecesPerStep; m++ {
		partM := s.LengthM / float64(m)
		part := s
		part.LengthM = partM
		if !sp.evaluate([]piece{{step: part, origin: origin, parts: 1}}).WithinRating {
			continue
		}
		pcs := make([]piece, m)
		for k := range pcs {
			pcs[k] = piece{step: s, origin: origin, part: k, parts: m, startM: startM + float64(k)*partM}
		}
		return pcs
	}
	return whole
}

// merge turns consecutive pieces back into steps, appended to dst: whole steps stay exact,
// parts of one straight are joined.
func merge(dst []Step, pcs []piece) []Step {
	for i := 0; i < len(pcs); {
		j := i + 1
		for j < len(pcs) && pcs[j].origin == pcs[i].origin {
			j++
		}
		s := pcs[i].step
		if n := j - i; n != pcs[i].parts {
			s.LengthM = s.LengthM / float64(pcs[i].parts) * float64(n)
		}
		dst = append(dst, s)
		i = j
	}
	return dst
}

// evaluate plans the pull of one section made of pcs (len(pcs) > 0); Span and the Added flags
// are left for the caller.
func (sp PullSpec) evaluate(pcs []piece) Section {
	sec := sp.measure(merge(nil, pcs), true)
	sec.StartM = pcs[0].startM

	if sec.MaxTensionN > sp.MaxTensionN {
		sec.Over = append(sec.Over, Excess{Limit: OverTension, Value: sec.MaxTensionN, Max: sp.MaxTensionN})
	}
	if sp.MaxSWBPNPerM > 0 && sec.MaxSWBPNPerM > sp.MaxSWBPNPerM {
		sec.Over = append(sec.Over, Excess{Limit: OverSidewall, Value: sec.MaxSWBPNPerM, Max: sp.MaxSWBPNPerM})
	}
	if sp.bendsOver(sec) {
		sec.Over = append(sec.Over, Excess{Limit: OverBends, Value: sec.BendDeg, Max: sp.MaxBendDeg})
	}
	if sp.lengthOver(sec) {
		sec.Over = append(sec.Over, Excess{Limit: OverLength, Value: sec.LengthM, Max: sp.MaxLengthM})
	}
	return sec
}

// Limits of a pull that a section may go over (Excess.Limit).
const (
	OverTension  = "tension"           // newtons
	OverSidewall = "sidewall pressure" // newtons per metre
	OverBends    = "bends"             // degrees between pull points
	OverLength   = "length"            // metres between pull points
)

// Excess is one limit of the PullSpec a section goes over: the section's figure and the
// limit, both in the limit's unit (newtons, N/m, degrees or metres; see OverTension…).
type Excess struct {
	Limit      string
	Value, Max float64
}

// Units writes the figures of an Excess for an output: each func formats a number in its SI
// unit as text with its unit ("12.3 m", "40.4 ft"); a nil func writes the SI unit with one
// decimal.
type Units struct {
	Length   func(m float64) string
	Force    func(n float64) string
	Pressure func(nPerM float64) string
}

// Text is the excess in words, its figures written by u: "tension 3000.0 N over rating
// 2670.0 N", "length 160.2 m over 150.0 m between pull points".
func (x Excess) Text(u Units) string {
	si := func(f func(float64) string, unit string) func(float64) string {
		if f != nil {
			return f
		}
		return func(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) + " " + unit }
	}
	switch x.Limit {
	case OverTension:
		f := si(u.Force, "N")
		return "tension " + f(x.Value) + " over rating " + f(x.Max)
	case OverSidewall:
		f := si(u.Pressure, "N/m")
		return "sidewall pressure " + f(x.Value) + " over " + f(x.Max)
	case OverBends:
		return fmt.Sprintf("bends %.1f° over %.1f° between pull points", x.Value, x.Max)
	}
	f := si(u.Length, "m")
	return "length " + f(x.Value) + " over " + f(x.Max) + " between pull points"
}

// Why writes over (a section's Over) as one text, its figures written by u; "" when empty.
func Why(over []Excess, u Units) string {
	why := make([]string, len(over))
	for i, x := range over {
		why[i] = x.Text(u)
	}
	return strings.Join(why, "; ")
}

// Reason is why the section is not within rating in SI units (Why with Units{}); "" when it is.
func (s Section) Reason() string { return Why(s.Over, Units{}) }

// measure plans the pull of a section of steps (validated by Sections): lengths, bends, both
// pulls, the best one and whether it is within rating, with the same arithmetic as evaluate
// but without the reason, and without the per-step tensions unless perStep. Steps holds
// steps, which the caller may reuse when it keeps only the figures.
func (sp PullSpec) measure(steps []Step, perStep bool) Section {
	sec := Section{Steps: steps}
	for _, s := range steps {
		sec.LengthM += s.LengthM
		if s.Kind == KindBend {
			sec.BendDeg += s.AngleDeg
		}
	}
	sec.Forward = tension(steps, false, sp.WNPerM, sp.Mu, sp.TInN, perStep)
	sec.Reverse = tension(steps, true, sp.WNPerM, sp.Mu, sp.TInN, perStep)
	sec.Best = Forward // as PullBothWays
	if sec.Reverse.MaxTensionN < sec.Forward.MaxTensionN {
		sec.Best = Reverse
	}
	if fok, rok := sp.pullOK(sec.Forward), sp.pullOK(sec.Reverse); fok != rok {
		sec.Best = Forward
		if rok {
			sec.Best = Reverse
		}
	}
	best := sec.Forward
	if sec.Best == Reverse {
		best = sec.Reverse
	}
	sec.MaxTensionN, sec.MaxSWBPNPerM = best.MaxTensionN, best.MaxSWBPNPerM
	sec.WithinRating = !(sec.MaxTensionN > sp.MaxTensionN) && !(sp.MaxSWBPNPerM > 0 && sec.MaxSWBPNPerM > sp.MaxSWBPNPerM) &&
		!sp.bendsOver(sec) && !sp.lengthOver(sec)
	return sec
}

func (sp PullSpec) pullOK(r Result) bool {
	return r.MaxTensionN <= sp.MaxTensionN && (sp.MaxSWBPNPerM == 0 || r.MaxSWBPNPerM <= sp.MaxSWBPNPerM)
}

func (sp PullSpec) bendsOver(sec Section) bool { return sec.BendDeg > sp.MaxBendDeg+bendTolDeg }

func (sp PullSpec) lengthOver(sec Section) bool {
	return sp.MaxLengthM > 0 && sec.LengthM > sp.MaxLengthM
}

// score orders partitions of a prefix: fewer sections out of rating, then fewer sections,
// then a lower highest tension.
type score struct {
	bad, sections int
	maxTensionN   float64
	prev          int // start of the last section
	set           bool
}

func (a score) less(b score) bool {
	if a.bad != b.bad {
		return a.bad < b.bad
	}
	if a.sections != b.sections {
		return a.sections < b.sections
	}
	return a.maxTensionN < b.maxTensionN
}

// partition splits one stretch between given pull points into sections, following the policy
// documented on Sections, and says where each starts: the index in pcs of its first piece.
func (sp PullSpec) partition(pcs []piece) ([]Section, []int) {
	n := len(pcs)
	level := true
	for _, p := range pcs {
		if p.step.Kind == KindStraight && p.step.InclineDeg != 0 {
			level = false
		}
	}
	dp := make([]score, n+1)
	dp[0].set = true
	var buf []Step // the section's steps, reused: the search keeps only its figures
	for i := 0; i < n; i++ {
		if !dp[i].set {
			continue
		}
		for j := i + 1; j <= n; j++ {
			buf = merge(buf[:0], pcs[i:j])
			sec := sp.measure(buf, false)
			if sec.WithinRating || j == i+1 {
				c := score{bad: dp[i].bad, sections: dp[i].sections + 1, maxTensionN: math.Max(dp[i].maxTensionN, sec.MaxTensionN), prev: i, set: true}
				if !sec.WithinRating {
					c.bad++
				}
				if !dp[j].set || c.less(dp[j]) {
					dp[j] = c
				}
			}
			// Bends and length only grow as a section extends, and so, on a level run, does
			// the tension from either end: once out of spec, every longer section is too.
			if !sec.WithinRating && (level || sp.bendsOver(sec) || sp.lengthOver(sec)) {
				break
			}
		}
	}
	var cuts []int
	for j := n; j > 0; j = dp[j].prev {
		cuts = append(cuts, j)
	}
	cuts = append(cuts, 0)
	secs := make([]Section, 0, len(cuts)-1)
	first := make([]int, 0, len(cuts)-1)
	for k := len(cuts) - 1; k > 0; k-- {
		sec := sp.evaluate(pcs[cuts[k]:cuts[k-1]])
		sec.StartAdded = cuts[k] != 0
		sec.EndAdded = cuts[k-1] != n
		secs = append(secs, sec)
		first = append(first, cuts[k])
	}
	return secs, first
}
