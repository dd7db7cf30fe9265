package route

import (
	"cmp"
	"fmt"
	"math"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/optimize"
)

// StandardStrandCounts are the fibre counts a required strand count rounds up to
// (common practice, no published source).
var StandardStrandCounts = []int{12, 24, 48, 72, 96, 144, 288}

// CableStrands rounds required × (1 + growth) up to a standard cable count; beyond the
// largest it rounds up to a multiple of the largest.
func CableStrands(required int, growth float64) int {
	n := int(math.Ceil(float64(required)*(1+growth) - 1e-9))
	for _, c := range StandardStrandCounts {
		if n <= c {
			return c
		}
	}
	big := StandardStrandCounts[len(StandardStrandCounts)-1]
	return (n + big - 1) / big * big
}

// ConnectorPairs is the number of mated connector pairs in a backbone channel: one patch
// panel at each end (ANSI/TIA-568.3-D channel model).
const ConnectorPairs = 2

// costModel prices a plan's pathways and media from the engine and its price book.
type costModel struct {
	eng    *media.Engine
	prices *media.PriceBook
	design Design
	// labourPerM holds installation labour in cents per metre of one cable, by pathway type.
	labourPerM map[string]int64
	// innerductPerM is the innerduct material per metre, when the design places innerduct;
	// placing it costs labourPerM[duct] again (one more pull).
	innerductPerM int64
	allowedMemo   map[allowedKey]bool
	// classes are the span classes of the campus in a fixed order, and classBit each one's flag.
	classes  []spanClass
	classBit map[spanClass]uint64
}

// Edge flags. flagDuct marks a duct edge, so that a cable too large for the design's
// innerduct can be kept off ducts. Every other flag is a span class (spanClass): the bit
// firstClassFlag << k marks the edges of the k-th class in the campus, and an option
// excludes the classes on which the rule engine does not let its medium run.
const (
	flagDuct       = optimize.FlagOutdoor << 1
	firstClassFlag = flagDuct << 1
)

// spanClass is what a span tells the rule engine about a route that runs on it: its EMI
// level, whether it is outdoors (every pathway but a tray), whether it is in a plenum, and its
// pathway type. Which media may run on a span is the rule engine's answer for a route with
// these facts (allowed), so a rule added to or removed from a rules file changes where the
// optimizer may route a medium; no medium rule is written in Go.
type spanClass struct {
	emi             string
	outdoor, plenum bool
	typ             string
}

func classOf(sp *geo.Span) spanClass {
	emi := sp.EMI
	if emi == "" {
		emi = geo.EMINone
	}
	return spanClass{emi: emi, outdoor: sp.Type != geo.TypeTray, plenum: sp.Plenum, typ: sp.Type}
}

// lateralClass is a counted lateral: a buried run out of the building with no EMI data.
var lateralClass = spanClass{emi: geo.EMINone, outdoor: true, typ: geo.TypeBuried}

func (c spanClass) facts(l media.Link) media.Link {
	l.MaxEMI, l.Outdoor, l.Plenum, l.PathwayTypes = c.emi, c.outdoor, c.plenum, []string{c.typ}
	return l
}

func (c spanClass) String() string {
	s := c.typ
	if c.emi != geo.EMINone {
		s += ", " + c.emi + " EMI"
	}
	if c.plenum {
		s += ", plenum"
	}
	return s
}

// allowedKey is what allowed's answer depends on.
type allowedKey struct {
	medium       string
	rate, future float64
	strands      int
	class        spanClass
}

// allowed reports whether the rules let medium carry a link of rate (and future rate) and
// strands on spans of class c, at some length, with no risers or slack: the rules that depend
// on the whole route or its ends are the media choice's to apply, on the route's own facts.
func (m *costModel) allowed(medium string, rate, future float64, strands int, c spanClass) bool {
	k := allowedKey{medium, rate, future, strands, c}
	if v, ok := m.allowedMemo[k]; ok {
		return v
	}
	l := c.facts(media.Link{ConnectorPairs: ConnectorPairs, Strands: strands})
	v := m.eng.MaxChannelM(medium, rate, future, l) > 0
	m.allowedMemo[k] = v
	return v
}

var (
	optionRef   = regexp.MustCompile(`option \d+ \("([^"]*)"\)`)
	flaggedEdge = regexp.MustCompile(`the edges this option may use \(it excludes edges flagged (0x[0-9a-f]+)\)`)
)

// explain puts the optimizer's account of an unroutable demand in the plan's words: options
// by their medium, edge flags as the span classes the rules keep the medium off.
func (m *costModel) explain(reason string) string {
	reason = optionRef.ReplaceAllString(reason, "$1")
	return flaggedEdge.ReplaceAllStringFunc(reason, func(s string) string {
		bits, err := strconv.ParseUint(flaggedEdge.FindStringSubmatch(s)[1], 0, 64)
		if err != nil {
			return s
		}
		var off []string
		if bits&flagDuct != 0 {
			off = append(off, "ducts (the cable does not fit the innerduct)")
		}
		for _, c := range m.classes {
			if bits&m.classBit[c] != 0 {
				off = append(off, c.String())
			}
		}
		return "the spans its rules allow (it may not run on: " + strings.Join(off, "; ") + ")"
	})
}

// whyNot is the rule engine's reason for keeping medium off spans of class c.
func (m *costModel) whyNot(medium string, facts media.Link, c spanClass) string {
	l := c.facts(facts)
	l.RouteM = 1
	for _, r := range m.eng.Choose(l).Rejected {
		if r.Medium == medium {
			return r.Reason
		}
	}
	return medium + " is not allowed there"
}

// innerductFits reports whether a cable of the given outside diameter fits the design's
// innerduct: one cable at most 53 % of its inside area (NFPA 70 Chapter 9 Table 1, one cable).
func (d Design) innerductFits(cableODMM float64) bool {
	return cableODMM*cableODMM <= 0.53*d.InnerductIDMM*d.InnerductIDMM
}

// ductPerCablePerM is what one cable costs per metre of a duct span beyond its own price and
// pull: with innerduct, the innerduct and the pull that places it.
func (m *costModel) ductPerCablePerM() int64 {
	if !m.design.Innerduct() {
		return 0
	}
	return m.innerductPerM + m.labourPerM[geo.TypeDuct]
}

// newCostModel reads the labour rates the plan needs; a missing rate is an error naming its key.
func newCostModel(eng *media.Engine, d Design) (*costModel, error) {
	p := eng.PriceBook()
	m := &costModel{eng: eng, prices: p, design: d, labourPerM: map[string]int64{},
		allowedMemo: map[allowedKey]bool{}}
	hour, ok := p.Price(media.PriceKey{Item: media.PriceLabourHour})
	var missing []string
	if !ok {
		missing = append(missing, media.PriceKey{Item: media.PriceLabourHour}.Path())
	}
	for _, t := range []string{geo.TypeDuct, geo.TypeTunnel, geo.TypeAerial, geo.TypeBuried, geo.TypeTray} {
		k := media.PriceKey{Item: media.RatePull, Name: t}
		rate, ok := p.Rate(k)
		if !ok || rate <= 0 {
			missing = append(missing, k.Path())
			continue
		}
		m.labourPerM[t] = int64(math.Round(float64(hour) / rate))
	}
	if d.Innerduct() {
		k := media.PriceKey{Item: media.PriceInnerduct}
		if m.innerductPerM, ok = p.Price(k); !ok {
			missing = append(missing, k.Path())
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("%s: %w: %v", p.File, media.ErrMissingPrice, missing)
	}
	return m, nil
}

// surfaceOf is the surface priced for new work on a span: its own, else turf.
func surfaceOf(sp *geo.Span) string {
	if sp.Surface != "" {
		return sp.Surface
	}
	return geo.SurfaceTurf
}

// newWorkPerMCents is the price of new work along a span, per metre: a directional bore when
// the span's method is bore (no open trench, no restoration), else trench with restoration of
// the span's surface.
func (m *costModel) newWorkPerMCents(sp *geo.Span) (int64, error) {
	if sp.Method == geo.MethodBore {
		k := media.PriceKey{Item: media.PriceBore}
		b, ok := m.prices.Price(k)
		if !ok {
			return 0, fmt.Errorf("%s: %w: %s", m.prices.File, media.ErrMissingPrice, k.Path())
		}
		return b, nil
	}
	s := surfaceOf(sp)
	t, ok1 := m.prices.Price(media.PriceKey{Item: media.PriceTrench, Name: s})
	r, ok2 := m.prices.Price(media.PriceKey{Item: media.PriceRestoration, Name: s})
	if !ok1 || !ok2 {
		return 0, fmt.Errorf("%s: %w: %s and %s", m.prices.File, media.ErrMissingPrice,
			media.PriceKey{Item: media.PriceTrench, Name: s}.Path(), media.PriceKey{Item: media.PriceRestoration, Name: s}.Path())
	}
	return t + r, nil
}

// problem builds the optimizer's problem: one edge per span (same index), one demand per link.
func (s *Site) problem(m *costModel, links []Link) (*optimize.Problem, []demandInfo, error) {
	net := s.Net
	groups := map[string]int{}
	var names []string
	for _, sp := range net.Spans {
		if _, ok := groups[sp.Group]; !ok && sp.Group != "" {
			groups[sp.Group] = 0
			names = append(names, sp.Group)
		}
	}
	sort.Strings(names)
	for i, n := range names {
		groups[n] = i + 1
	}
	m.classes, m.classBit = nil, map[spanClass]uint64{}
	for i := range net.Spans {
		if c := classOf(&net.Spans[i]); m.classBit[c] == 0 {
			m.classBit[c] = 1 // numbered below, in a fixed order
			m.classes = append(m.classes, c)
		}
	}
	slices.SortFunc(m.classes, func(a, b spanClass) int {
		return cmp.Or(strings.Compare(a.typ, b.typ), strings.Compare(a.emi, b.emi), boolCmp(a.outdoor, b.outdoor), boolCmp(a.plenum, b.plenum))
	})
	for k, c := range m.classes {
		// At most 5 pathway types × 3 EMI levels × plenum or not: 30 classes, well within
		// the flags above firstClassFlag.
		m.classBit[c] = firstClassFlag << k
	}
	addDuct, _ := m.prices.Price(media.PriceKey{Item: media.PriceAddedDuct})
	p := &optimize.Problem{Nodes: len(net.Junctions), AllowNew: m.design.AllowNewTrench,
		Edges: make([]optimize.Edge, len(net.Spans))}
	// Duct fill: the optimizer's incremental NFPA 70 Chapter 9 Table 1 packing (nil Fits).
	for i := range net.Spans {
		sp := &net.Spans[i]
		u, _ := s.Graph.NodeOf(sp.From)
		v, _ := s.Graph.NodeOf(sp.To)
		e := optimize.Edge{ID: sp.ID, From: int(u), To: int(v), LengthM: sp.LengthM,
			LabourPerMCents: m.labourPerM[sp.Type], Group: groups[sp.Group], Flags: m.classBit[classOf(sp)]}
		if sp.Type == geo.TypeDuct {
			e.Flags |= flagDuct
			e.LabourPerMCents += m.ductPerCablePerM()
		}
		work, err := m.newWorkPerMCents(sp)
		if sp.Status == geo.StatusProposed {
			if err != nil {
				return nil, nil, err
			}
			perM := work
			if sp.Type == geo.TypeDuct {
				perM += addDuct
			}
			e.Proposed, e.FixedCents = true, media.MulCents(perM, sp.LengthM)
		} else if sp.Type == geo.TypeDuct {
			e.Ducts, e.DuctIDMM = sp.SpareDucts, sp.DuctMM
			if err == nil && addDuct > 0 {
				e.AddDuctPerMCents = work + addDuct
			}
		}
		p.Edges[i] = e
	}
	infos := make([]demandInfo, len(links))
	for i := range links {
		d, info := s.demand(m, &links[i])
		p.Demands = append(p.Demands, d)
		infos[i] = info
	}
	return p, infos, nil
}

// demandInfo is what the pipeline keeps about a link's demand to cost and explain its legs.
type demandInfo struct {
	facts    media.Link // route-independent facts; RouteM and the route facts are filled per leg
	rate     float64
	strands  int // cable strands after growth and rounding
	constM   float64
	options  []string
	excluded []string // media left out before routing, with why
}

// demand turns a link into the optimizer's demand with one option per medium that can carry it.
func (s *Site) demand(m *costModel, l *Link) (optimize.Demand, demandInfo) {
	src, dst := s.access[l.To], s.access[l.From]
	srcN, _ := s.Graph.NodeOf(src.Junction)
	dstN, _ := s.Graph.NodeOf(dst.Junction)
	rate, _ := m.eng.Catalog().ParseRate(l.Rate)
	future := 0.0
	if l.FutureRate != "" {
		future, _ = m.eng.Catalog().ParseRate(l.FutureRate)
	}
	strands := CableStrands(l.Strands, l.Growth)
	riser := s.building[l.To].RiserM + s.building[l.From].RiserM
	lateral := src.LateralM + dst.LateralM
	slack := 2 * m.design.SlackM
	facts := media.Link{ID: l.ID, RiserM: riser, SlackM: slack, RateGbps: rate, FutureRateGbps: future,
		MaxEMI: geo.EMINone, ConnectorPairs: ConnectorPairs, Strands: strands}
	info := demandInfo{facts: facts, rate: rate, strands: strands, constM: riser + lateral + slack}
	d := optimize.Demand{ID: l.ID, Source: int(srcN), Target: int(dstN), Diverse: l.Diverse}
	for _, med := range m.eng.Media() {
		mm := m.eng.Catalog().Medium(med)
		if lateral > 0 && !m.allowed(med, rate, future, strands, lateralClass) {
			info.excluded = append(info.excluded, fmt.Sprintf("%s: the route leaves a building over a lateral: %s", med, m.whyNot(med, facts, lateralClass)))
			continue
		}
		var exclude uint64
		for _, c := range m.classes {
			if !m.allowed(med, rate, future, strands, c) {
				exclude |= m.classBit[c]
			}
		}
		maxCh := m.eng.MaxChannelM(med, rate, future, facts)
		maxRoute := maxCh - riser - slack - lateral
		perM := m.eng.CablePerMCents(med, strands, true)
		fixed := m.eng.FixedCents(med, rate, strands)
		switch {
		case perM < 0 || fixed < 0:
			info.excluded = append(info.excluded, fmt.Sprintf("%s: the price book prices no cable, termination or transceiver it needs at %s", med, media.FormatRate(rate)))
			continue
		case maxRoute <= 0:
			info.excluded = append(info.excluded, fmt.Sprintf("%s: reaches at most %.1f m of channel; risers, slack and laterals alone take %.1f m", med, maxCh, riser+slack+lateral))
			continue
		}
		// Route-independent lengths (risers, laterals, slack) cost the same whatever the path.
		fixed += media.MulCents(perM, riser+lateral+slack) + media.MulCents(m.labourPerM[geo.TypeTray], riser) +
			media.MulCents(m.labourPerM[geo.TypeBuried], lateral)
		od := cableOD(mm, strands)
		if m.design.Innerduct() {
			if !m.design.innerductFits(od) {
				exclude |= flagDuct
				info.excluded = append(info.excluded, fmt.Sprintf("%s: its %g mm cable does not fit the %g mm innerduct (53 %% fill, NFPA 70 Chapter 9 Table 1), so it is kept off ducts",
					med, od, m.design.InnerductIDMM))
			}
			od = m.design.InnerductODMM // ducts hold the innerducts
		}
		d.Options = append(d.Options, optimize.Option{Name: med, CablePerMCents: perM, FixedCents: fixed,
			MaxRouteM: maxRoute, ExcludeFlags: exclude, CableODMM: od})
		info.options = append(info.options, med)
	}
	return d, info
}

// cableOD is the outside diameter in millimetres of the outdoor-rated cable of the medium
// for the strands, or of its first construction when none is outdoor-rated.
func cableOD(m *media.Medium, strands int) float64 {
	if m.Kind == media.KindCopper {
		strands = (strands + 1) / 2
	}
	for _, k := range m.Constructions {
		if k.OutdoorRated {
			size, _ := k.Fit(strands)
			return size.ODMM
		}
	}
	if len(m.Constructions) > 0 {
		size, _ := m.Constructions[0].Fit(strands)
		return size.ODMM
	}
	return 0
}
