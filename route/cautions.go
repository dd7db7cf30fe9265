package route

import (
	"maps"
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/estimate"
	"spanwright/route/routing"
)

// Caution is one safety caution a planned scenario calls for: what the crew must do, what in
// this plan calls for it, and the source. Cautions are computed once from the plan
// (cautionsOf, into Result.Cautions) and every output for people shows that one list: the
// report's safety section, the safety sheet of bom.xlsx and one line of the terminal.
type Caution struct {
	ID     string // short, stable: CautionLocates, CautionTrench, …
	Title  string // "Trench cave-in"
	Where  string // what in this plan calls for it, by id: "new trench along spans P-5, P-6"
	Text   string // what to do
	Source string // where it comes from, rated as the catalog rates its values
	// places are the handholes on a span or lateral Where names, each by its place in
	// metres (estimate.MetresText), which WhereIn writes in another output's units.
	places []estimate.PullPoint
	// legs are the indices in Result.Legs of the legs whose own work calls for it (LegCautions).
	legs []int
}

// LegCautions are the IDs of the cautions (Result.Cautions, in their order) that leg i's own
// work calls for: the spans, junctions and laterals of its route that the caution is about,
// its medium for the laser and copper cautions. links.csv gives them per row, short keys into
// the safety sheet that lists each in full (tester 14 F16); none for an infeasible leg.
func (r *Result) LegCautions(i int) []string {
	var ids []string
	for _, c := range r.Cautions {
		if slices.Contains(c.legs, i) {
			ids = append(ids, c.ID)
		}
	}
	return ids
}

// WhereIn is Where with the distances of the handholes it names written by length (an
// output's units), as the structures table writes their places (estimate.PullPoint.Text).
// With estimate.MetresText it is Where.
func (c Caution) WhereIn(length func(m float64) string) string {
	w := c.Where
	for _, p := range c.places {
		w = strings.ReplaceAll(w, p.Text(estimate.MetresText), p.Text(length))
	}
	return w
}

// The cautions' IDs, in the order they are listed.
const (
	CautionLocates  = "locates"
	CautionTrench   = "trench"
	CautionBore     = "bore"
	CautionPower    = "power"
	CautionDuctBank = "duct-bank"
	CautionBuried   = "buried"
	CautionAerial   = "aerial"
	CautionTunnel   = "tunnel"
	CautionConfined = "confined-space"
	CautionLaser    = "laser"
	CautionCopper   = "copper-outdoor"
	CautionMetallic = "metallic-members"
)

// PlanningAid says what spanwright's output is and is not: said wherever a plan's figures are
// read (before the cautions, summary.json, a sweep's comparison files).
const PlanningAid = "Spanwright is a planning aid. Its output is not a construction document and does not replace the judgement of licensed professionals, the local codes in force or the authority having jurisdiction, which always prevail."

// CautionsPreamble and CautionsClosing are said before and after the cautions, whatever the
// plan, wherever they are shown.
const (
	CautionsPreamble = PlanningAid + " The cautions below are those this plan's work calls for; the work may call for others."
	CautionsClosing  = "Codes are law where adopted; TIA documents are design standards; IEEE sets application limits. Defer to local codes, the authority having jurisdiction and licensed practice."
)

// shownIDs is the most ids a caution's Where names before counting the rest.
const shownIDs = 6

// shownPits is the most handholes to set a caution's Where names before counting the rest:
// more than shownIDs, for the crew reads each pit it digs off the list (tester 11's finding 1).
const shownPits = 12

// idList names ids in sorted order, at most shownIDs of them and a count of the rest.
func idList(ids []string) string { return namedList(ids, shownIDs) }

// namedList names ids in sorted order, at most n of them and a count of the rest.
func namedList(ids []string, n int) string {
	shown, more := input.Shown(slices.Sorted(slices.Values(ids)), n)
	return strings.Join(shown, ", ") + more
}

// pathways is "pathway A" or "pathways A, B" (idList).
func pathways(ids []string) string {
	if len(ids) == 1 {
		return "pathway " + ids[0]
	}
	return "pathways " + idList(ids)
}

// entering keeps the legs whose cable carries metal into buildings from outside (copper, or
// fibre with metallic members) and the entrances where it does, each once, for the caution
// that names both.
type entering struct{ legs, at seenList }

func (e *entering) add(l *routing.Leg) {
	e.legs.add(l.Label())
	for _, en := range []string{l.EntranceTo, l.EntranceFrom} {
		if en != "" {
			e.at.add(en)
		}
	}
}

// where names the legs and what is done at the entrances: "1 copper leg leaving a building:
// A-B/primary; primary protectors at 2 entrances A:1, B:1".
func (e *entering) where(one, many, done string) string {
	w := input.Counted(len(e.legs.ids), one, many) + " leaving a building: " + idList(e.legs.ids)
	if len(e.at.ids) > 0 {
		w += "; " + done + " at " + input.Counted(len(e.at.ids), "entrance", "entrances") + " " + idList(e.at.ids)
	}
	return w
}

// seenList keeps ids in the order first seen, each once.
type seenList struct {
	ids  []string
	seen map[string]bool
}

func (s *seenList) add(id string) {
	if s.seen == nil {
		s.seen = map[string]bool{}
	}
	if !s.seen[id] {
		s.seen[id] = true
		s.ids = append(s.ids, id)
	}
}

// cautionsOf is the one decision of which cautions a plan calls for, from its feasible legs
// and its estimate: each is listed when the plan has what it is about (new trench, a bore, a
// pole line, …), in a fixed order, naming what calls for it. The same result gives the same
// list.
func cautionsOf(r *Result) []Caution {
	net := r.Site.Net
	var aerial, tunnel, buried, holes seenList
	aerialLegs, tunnelLegs, buriedLegs := 0, 0, 0
	fibre := 0
	var copper, metallic entering
	facts := make([]legFacts, len(r.Legs)) // what each feasible leg's own work has, for Caution.legs
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		f := &facts[i]
		f.feasible = true
		f.spans, f.junctions = map[string]bool{}, map[string]bool{}
		f.entrances = []string{l.EntranceTo, l.EntranceFrom}
		f.buildings = []string{l.Link.To, l.Link.From}
		onAerial, onTunnel, onBuried := false, false, false
		for _, st := range l.Steps {
			f.spans[st.SpanID] = true
			sp, ok := net.Span(st.SpanID)
			if !ok {
				continue
			}
			switch sp.Type {
			case geo.TypeAerial:
				aerial.add(sp.PathwayID)
				onAerial = true
			case geo.TypeTunnel:
				tunnel.add(sp.PathwayID)
				onTunnel = true
			case geo.TypeBuried:
				if sp.Status != geo.StatusProposed {
					buried.add(sp.PathwayID)
					onBuried = true
				}
			}
		}
		for _, j := range r.Site.JunctionsOf(l.Steps) {
			f.junctions[j] = true
			if jn, ok := net.Junction(j); ok && jn.Kind == geo.JunctionStructure && jn.StructureType == geo.StructureMaintenanceHole {
				holes.add(j)
				f.holes = true
			}
		}
		aerialLegs += b2i(onAerial)
		tunnelLegs += b2i(onTunnel)
		buriedLegs += b2i(onBuried)
		f.aerial, f.tunnel, f.buried = onAerial, onTunnel, onBuried
		if m := r.Engine.Catalog().Medium(l.Medium); m != nil {
			if m.Fibre() {
				fibre++
				f.fibre = true
				if k := m.Construction(l.Construction); k != nil && k.MetallicMembers && l.Outdoor {
					f.metallic = true
					metallic.add(l)
				}
			} else if l.Outdoor {
				f.copper = true
				copper.add(l)
			}
		}
	}

	// New civil work, by method: the bill's pieces (estimate.Construction.Pieces: opened
	// spans, trenches or bores for ducts added beside full ones, counted laterals), and the
	// spans of it the campus marks emi high (geo.EMIHigh).
	var trench, bore, powerWork seenList
	// Proposed pathways opened that are not dug (items.Dug), by type: a new pole line's
	// poles are set in augered holes, a new tunnel is dug and then entered; a new tray is
	// indoor work with none of these cautions.
	var newPoles, newTunnel seenList
	laterals := [2]int{}            // trenched, bored
	powerSpans := map[string]bool{} // the spans of powerWork, for Caution.legs
	if e := r.Estimate; e != nil {
		for _, w := range e.Construction.Pieces {
			isBore := w.Method == geo.MethodBore
			switch {
			case w.Method == geo.TypeAerial:
				newPoles.add(w.Span)
				continue
			case w.Method == geo.TypeTunnel:
				newTunnel.add(w.Span)
				continue
			case w.Method == geo.TypeTray:
				continue
			case w.Span == "":
				laterals[b2i(isBore)]++
			case isBore:
				bore.add(w.Span)
			default:
				trench.add(w.Span)
			}
			if sp, ok := net.Span(w.Span); ok && sp.EMI == geo.EMIHigh {
				powerSpans[w.Span] = true
				if isBore {
					powerWork.add("directional bore along span " + w.Span)
				} else {
					powerWork.add("trench along span " + w.Span)
				}
			}
		}
	}
	pits := pitsOf(r)
	var pitNames, onBanks []string
	var bankPathways seenList
	var places []estimate.PullPoint                           // of the pits on spans and laterals, for Caution.WhereIn
	emiPits, bankPits := map[string]bool{}, map[string]bool{} // by name, for Caution.legs
	for _, p := range pits {
		pitNames = append(pitNames, p.name)
		if p.at != nil {
			places = append(places, *p.at)
		}
		var emi []string
		for _, id := range p.spans {
			sp, ok := net.Span(id)
			if !ok {
				continue
			}
			if sp.EMI == geo.EMIHigh {
				emi = append(emi, id)
			}
			if sp.Status != geo.StatusProposed && (sp.Type == geo.TypeDuct || sp.Type == geo.TypeBuried) {
				if len(onBanks) == 0 || onBanks[len(onBanks)-1] != p.name {
					onBanks = append(onBanks, p.name)
				}
				bankPits[p.name] = true
				bankPathways.add(sp.PathwayID)
			}
		}
		if len(emi) > 0 {
			emiPits[p.name] = true
			powerWork.add("handhole " + p.name + " at " + strings.TrimPrefix(spansText(emi, 0), ": "))
		}
	}
	pitsCount := ""
	if len(pits) > 0 {
		pitsCount = input.Counted(len(pits), "handhole to set", "handholes to set")
	}

	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	var dig []string
	if len(trench.ids) > 0 || laterals[0] > 0 {
		dig = append(dig, "new trench"+spansText(trench.ids, laterals[0]))
	}
	if len(bore.ids) > 0 || laterals[1] > 0 {
		dig = append(dig, "directional bore"+spansText(bore.ids, laterals[1]))
	}
	if pitsCount != "" {
		dig = append(dig, pitsCount)
	}
	if len(buried.ids) > 0 {
		dig = append(dig, "cable laid along existing direct-buried "+pathways(buried.ids))
	}
	if len(newPoles.ids) > 0 {
		dig = append(dig, "pole holes of the new pole line"+spansText(newPoles.ids, 0))
	}
	if len(newTunnel.ids) > 0 {
		dig = append(dig, "excavation for the new tunnel"+spansText(newTunnel.ids, 0))
	}
	if len(dig) > 0 {
		add(Caution{ID: CautionLocates, Title: "Buried utilities",
			Where: strings.Join(dig, "; "),
			Text:  "Before any excavation, trenching, boring or setting of a handhole, request utility locates through the local one-call service and hand-dig (or vacuum-excavate) within the tolerance zone of every marked line. New construction in this plan is a cost alternative, not a cleared alignment.",
			// common practice, no published source: one-call notification is law in most US
			// states, each with its own tolerance zone.
			Source: "state one-call (811) laws, each with its own tolerance zone (from memory); common practice"})
	}
	// Every excavation a worker enters, not only a trench: a handhole's pit and a bore's
	// entry and exit pits too (29 CFR 1926.650(b)'s "excavation", from memory; tester 11's
	// finding 1).
	var pitsDug []string
	if len(trench.ids) > 0 || laterals[0] > 0 {
		pitsDug = append(pitsDug, "new trench"+spansText(trench.ids, laterals[0]))
	}
	if len(bore.ids) > 0 || laterals[1] > 0 {
		pitsDug = append(pitsDug, "entry and exit pits of the directional bore"+spansText(bore.ids, laterals[1]))
	}
	if pitsCount != "" {
		pitsDug = append(pitsDug, pitsCount+": "+namedList(pitNames, shownPits))
	}
	if len(newTunnel.ids) > 0 {
		pitsDug = append(pitsDug, "excavation for the new tunnel"+spansText(newTunnel.ids, 0))
	}
	if len(pitsDug) > 0 {
		add(Caution{ID: CautionTrench, places: places, Title: "Trench and excavation cave-in",
			Where: strings.Join(pitsDug, "; "),
			Text:  "Every excavation a worker enters is covered, not only a trench: the pit dug for each handhole and the entry and exit pits of each bore too. One 1.5 m (5 ft) deep or more needs a protective system (sloping, benching, shoring or a trench shield) unless it is entirely in stable rock, and a shallower one where a competent person sees signs of a cave-in; the competent person inspects it daily and after rain; keep spoil and equipment at least 0.6 m (2 ft) from the edge; a ladder or ramp within 7.6 m (25 ft) of travel in a trench 1.2 m (4 ft) deep or more.",
			// 1926.652(a)(1) and 1926.651(j)(2), (k) seen in a secondary republication of the
			// text; 1926.651(c)(2) (egress) and 1926.650(b) (an excavation is any man-made
			// cut, cavity, trench or depression formed by earth removal) from memory.
			Source: "in the US, 29 CFR 1926 Subpart P: 1926.652(a)(1), 1926.651(j)(2) and (k) (seen in a secondary publication), 1926.650(b) and 1926.651(c)(2) (from memory)"})
	}
	if len(bore.ids) > 0 || laterals[1] > 0 {
		add(Caution{ID: CautionBore, Title: "Directional bore",
			Where:  "directional bore" + spansText(bore.ids, laterals[1]),
			Text:   "A bore needs the same locates along its whole path, with every utility it crosses or runs beside exposed (potholed) to confirm its depth, and a bore plan from the contractor: entry and exit pits, depth profile, clearances to the utilities crossed and how the drill head is tracked. Ground the rig and use strike alert where a power line may be hit.",
			Source: "common practice, no published source (one-call laws require the locates; from memory)"})
	}
	if len(powerWork.ids) > 0 {
		add(Caution{ID: CautionPower, places: places, Title: "Power conductors near new work",
			Where:  "new work on or beside spans the campus marks emi high: " + idList(powerWork.ids),
			Text:   "The campus marks these spans as near a source of high electromagnetic interference, on a campus most often energized power cable: before digging, boring or setting a handhole there, have the owner locate the power conductors, expose them by hand or vacuum excavation where the work comes near, treat every conductor found as energized until its owner has de-energized and grounded it, and keep the crew and its tools out of reach of it (an electrical hazard: qualified workers only near exposed power conductors). Ground the bore rig and use strike alert.",
			Source: "in the US, 29 CFR 1926.416(a)(1) and (3) and 1926.651(b) (from memory); common practice, no published source"})
	}
	if len(onBanks) > 0 {
		add(Caution{ID: CautionDuctBank, places: places, Title: "Handholes built on existing duct banks",
			Where:  input.Counted(len(onBanks), "handhole", "handholes") + " to set into existing ducts or direct-buried cable: " + namedList(onBanks, shownPits) + " (" + pathways(bankPathways.ids) + ")",
			Text:   "Each is built around ducts or cable already in service, which may carry live circuits the campus data does not show: ask the owner which ducts are occupied, expose the bank by hand, break out only the duct walls the new handhole needs (a split or built-around handhole), support and protect the cables in service while it is built, and coordinate any outage with their owners. The bill prices these at the price book's handhole price, as a handhole in open ground.",
			Source: "common practice, no published source"})
	}
	if len(buried.ids) > 0 {
		add(Caution{ID: CautionBuried, Title: "Digging beside direct-buried cable",
			Where:  input.Counted(buriedLegs, "leg", "legs") + " laid along existing direct-buried " + pathways(buried.ids),
			Text:   "A new cable along a direct-buried route is laid in ground opened beside the cable already there (trench or plough): locate that cable, expose it by hand where the new work comes near it, and lay only cable rated for direct burial. The bill prices the laying at the price book's buried rate; excavation along an existing direct-buried route is not priced apart.",
			Source: "common practice, no published source"})
	}
	if len(aerial.ids) > 0 || len(newPoles.ids) > 0 {
		var where []string
		if len(aerial.ids) > 0 {
			where = append(where, input.Counted(aerialLegs, "leg", "legs")+" on aerial "+pathways(aerial.ids))
		}
		text := "Work on poles near overhead power conductors is for qualified workers only, keeping the minimum approach distance for the voltage; test a wood pole before climbing it, use fall protection and insulating gloves when handling strand on poles with energized power conductors, and place the cable in the communication space below the power supply space with the clearances the pole owner and the electrical safety code require. Attaching to a pole takes the owner's permit and any make-ready work."
		if len(newPoles.ids) > 0 {
			where = append(where, "new pole line to build"+spansText(newPoles.ids, 0))
			text += " A new pole line is set and strung by qualified line workers: site every pole and the strand at the clearances from overhead power lines, roads and buildings that the electrical safety code and the power utility require, keep the crane or digger derrick clear of energized lines, and guy its corners and dead ends; its pole holes need utility locates first."
		}
		add(Caution{ID: CautionAerial, Title: "Pole lines",
			Where: strings.Join(where, "; "),
			Text:  text,
			// 1910.268(n) (overhead lines, pole testing before climbing) seen in a secondary
			// publication; the NESC clearances and 1926 Subpart V for construction from memory.
			Source: "in the US, 29 CFR 1910.268(n) (seen in a secondary publication) and, for construction work, 29 CFR 1926 (from memory); NESC (ANSI C2) Part 2 clearances (from memory)"})
	}
	if len(tunnel.ids) > 0 || len(newTunnel.ids) > 0 {
		var where []string
		if len(tunnel.ids) > 0 {
			where = append(where, input.Counted(tunnelLegs, "leg", "legs")+" through tunnel "+pathways(tunnel.ids))
		}
		if len(newTunnel.ids) > 0 {
			where = append(where, "new tunnel to build"+spansText(newTunnel.ids, 0))
		}
		add(Caution{ID: CautionTunnel, Title: "Utility tunnels",
			Where:  strings.Join(where, "; "),
			Text:   "Steam and hot-water lines make tunnels hot (heat stress) and a leaking joint can scald: enter only with the owner's permit and escort, with ventilation, lighting and a way out both ways checked, never alone, and keep cable off steam lines. A tunnel the owner classifies as a permit-required confined space is entered as one.",
			Source: "in the US, 29 CFR 1910.146 for permit spaces (from memory); common practice, no published source"})
	}
	if len(holes.ids) > 0 || len(newTunnel.ids) > 0 {
		var where []string
		text := "Maintenance holes and vaults are permit-required confined spaces: test the atmosphere, ventilate, and keep an attendant at the opening."
		if len(holes.ids) > 0 {
			where = append(where, input.Counted(len(holes.ids), "maintenance hole", "maintenance holes")+" passed: "+idList(holes.ids))
		}
		if len(newTunnel.ids) > 0 {
			where = append(where, "new tunnel to build"+spansText(newTunnel.ids, 0))
			text += " A tunnel being built is entered as one until the competent person has classified it: its atmosphere tested before and during the work, ventilated, with a way out kept clear."
		}
		add(Caution{ID: CautionConfined, Title: "Confined spaces",
			Where:  strings.Join(where, "; "),
			Text:   text,
			Source: "in the US, 29 CFR 1910.146 and 1910.268(o) (from memory)"})
	}
	if fibre > 0 {
		add(Caution{ID: CautionLaser, Title: "Laser light",
			Where:  input.Counted(fibre, "fibre leg", "fibre legs"),
			Text:   "Light at 850, 1310 and 1550 nm is invisible and can injure the eye: never look into a fibre end or connector; use an inspection scope with a filter or a power meter.",
			Source: "IEC 60825-1, -2 (from memory)"})
	}
	if len(copper.legs.ids) > 0 {
		add(Caution{ID: CautionCopper, Title: "Lightning and ground potential rise on copper between buildings",
			Where:  copper.where("copper leg", "copper legs", "primary protectors"),
			Text:   "Copper entering a building from outside needs a listed primary protector at the entrance and bonding; all-dielectric fibre between buildings avoids both.",
			Source: "NFPA 70 Articles 800 and 805, 800.90 (seen)"})
	}
	if len(metallic.legs.ids) > 0 {
		add(Caution{ID: CautionMetallic, Title: "Metal in fibre cable between buildings",
			Where:  metallic.where("fibre leg with metallic members", "fibre legs with metallic members", "members bonded"),
			Text:   "Armour or a metallic strength member carries lightning and ground potential rise into a building as copper does: bond or ground the metallic members as close as practicable to where the cable enters, to the building's intersystem bonding termination, or interrupt them there with an insulating joint, before the cable is worked on inside; the bill's \"" + media.BondingItem + "\" line counts each cable end.",
			Source: "NFPA 70 Article 770, 770.93 and 770.100 (from memory)"})
	}

	// Which legs' own work calls for each caution: the same sets as above, asked of each leg
	// through what its route has (its spans, junctions and entrances), by index.
	const (
		kTrench  = 1 << iota // new trench on the span
		kBore                // bored
		kPoles               // a new pole line
		kTunnel              // a new tunnel
		kPower               // new work on a span marked emi high
		kPit                 // a handhole set here (at the junction, or along the span)
		kPitEMI              // a handhole set beside a span marked emi high
		kPitBank             // a handhole set into an existing duct bank
	)
	bySpan, byJunction := map[string]int{}, map[string]int{}
	for _, set := range []struct {
		ids  []string
		kind int
	}{{trench.ids, kTrench}, {bore.ids, kBore}, {newPoles.ids, kPoles}, {newTunnel.ids, kTunnel}, {slices.Sorted(maps.Keys(powerSpans)), kPower}} {
		for _, id := range set.ids {
			bySpan[id] |= set.kind
		}
	}
	for _, p := range pits {
		kind := kPit
		if emiPits[p.name] {
			kind |= kPitEMI
		}
		if bankPits[p.name] {
			kind |= kPitBank
		}
		if p.at == nil {
			byJunction[p.name] |= kind
		}
		for _, id := range p.spans {
			if p.at != nil {
				bySpan[id] |= kind
			}
		}
	}
	has := make([]int, len(facts)) // per leg: the kinds above its own work has
	for i := range facts {
		f := &facts[i]
		for id := range f.spans {
			has[i] |= bySpan[id]
		}
		for id := range f.junctions {
			has[i] |= byJunction[id]
		}
		for k, b := range f.buildings {
			if r.Estimate == nil {
				break
			}
			switch w, ok := r.Estimate.Construction.LateralPiece(b, f.entrances[k]); {
			case ok && w.Method == geo.MethodBore:
				has[i] |= kBore
			case ok && w.Method == geo.MethodTrench:
				has[i] |= kTrench
			}
		}
	}
	hasKind := func(i, kinds int) bool { return has[i]&kinds != 0 }
	dug := kTrench | kBore | kPit
	calls := map[string]func(i int) bool{
		CautionLocates:  func(i int) bool { return facts[i].buried || hasKind(i, dug|kPoles|kTunnel) },
		CautionTrench:   func(i int) bool { return hasKind(i, dug|kTunnel) },
		CautionBore:     func(i int) bool { return hasKind(i, kBore) },
		CautionPower:    func(i int) bool { return hasKind(i, kPower|kPitEMI) },
		CautionDuctBank: func(i int) bool { return hasKind(i, kPitBank) },
		CautionBuried:   func(i int) bool { return facts[i].buried },
		CautionAerial:   func(i int) bool { return facts[i].aerial || hasKind(i, kPoles) },
		CautionTunnel:   func(i int) bool { return facts[i].tunnel || hasKind(i, kTunnel) },
		CautionConfined: func(i int) bool { return facts[i].holes || hasKind(i, kTunnel) },
		CautionLaser:    func(i int) bool { return facts[i].fibre },
		CautionCopper:   func(i int) bool { return facts[i].copper },
		CautionMetallic: func(i int) bool { return facts[i].metallic },
	}
	for k := range out {
		call, ok := calls[out[k].ID]
		if !ok {
			panic("route: cautionsOf lists caution " + out[k].ID + " without the legs that call for it")
		}
		for i := range facts {
			if facts[i].feasible && call(i) {
				out[k].legs = append(out[k].legs, i)
			}
		}
	}
	return out
}

// legFacts is what one feasible leg's own work has, as cautionsOf asks it of each caution:
// the spans and junctions of its route, its entrances and buildings (its counted laterals),
// and the kinds of pathway, structure and medium it uses.
type legFacts struct {
	feasible         bool
	spans, junctions map[string]bool
	// buildings are the leg's two ends and entrances the entrance it uses at each (the
	// counted laterals it takes), index for index.
	entrances, buildings                                   []string
	aerial, tunnel, buried, holes, fibre, copper, metallic bool
}

// pit is a handhole the plan sets, dug where a crew works: its place as the structures table
// names it, and the spans it is built on or at (none on a counted lateral).
type pit struct {
	name  string
	spans []string
	at    *estimate.PullPoint // a handhole on a span or lateral, whose name gives its distance; nil at a junction
}

// pitsOf lists every handhole the plan sets, each once, in the structures table's order and
// with its names (output.StructuresOf): at junctions without a structure, whatever their
// reasons (Result.Handholes), along new construction (estimate.Construction.RunHandholes),
// for the pull points the pulling plan adds (estimate.Estimate.PullPointsAdded) and for the
// splice points to build on a span (estimate.Estimate.SplicePoints) but on an aerial span's
// strand, where the splice point is a closure and nothing is dug. A splice point off the
// spans (in a riser, a slack loop or a lateral) has no place the structures table gives; the
// bill and the warnings name it. The one list the excavation cautions read: the locates,
// the cave-in protection, the power conductors near new work and the existing duct banks.
func pitsOf(r *Result) []pit {
	net := r.Site.Net
	var out []pit
	seen := map[string]bool{}
	add := func(p pit) {
		if !seen[p.name] {
			seen[p.name] = true
			out = append(out, p)
		}
	}
	atJunction := func(id string) pit {
		m, _ := net.MeetingAt(id)
		return pit{name: id, spans: m.Spans}
	}
	hs := slices.Clone(r.Handholes)
	slices.SortStableFunc(hs, func(a, b routing.Handhole) int { return strings.Compare(a.Junction, b.Junction) })
	for _, h := range hs {
		add(atJunction(h.Junction))
	}
	e := r.Estimate
	if e == nil {
		return out
	}
	along := func(p estimate.PullPoint, spans ...string) pit {
		return pit{name: p.Text(estimate.MetresText), spans: spans, at: &p}
	}
	for _, h := range e.Construction.RunHandholes {
		sp, _ := net.Span(h.Span)
		add(along(estimate.PullPoint{Span: h.Span, AtM: h.AtM, End: net.EndName(sp.From)}, h.Span))
	}
	for _, p := range e.PullPointsAdded {
		switch _, isSpan := net.Span(p.Span); {
		case p.Span == "" && p.ID != "":
			add(atJunction(p.ID))
		case isSpan:
			add(along(p, p.Span))
		default: // on a counted lateral
			add(along(p))
		}
	}
	for _, sp := range e.SplicePoints {
		if !sp.At.BuildsHandhole(net) {
			continue
		}
		add(along(estimate.PullPoint{Span: sp.At.Span, AtM: sp.At.AtM, End: sp.At.End}, sp.At.Span))
	}
	return out
}

// spansText is ": span A, B and 3 counted laterals", for a caution's Where.
func spansText(ids []string, laterals int) string {
	var parts []string
	if len(ids) == 1 {
		parts = append(parts, "span "+ids[0])
	} else if len(ids) > 1 {
		parts = append(parts, "spans "+idList(ids))
	}
	if laterals > 0 {
		parts = append(parts, input.Counted(laterals, "counted lateral", "counted laterals"))
	}
	return ": " + strings.Join(parts, " and ")
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// CautionTitles are the titles of cs, for a one-line mention (the terminal).
func CautionTitles(cs []Caution) []string {
	out := make([]string, len(cs))
	for i, c := range cs {
		out[i] = c.Title
	}
	return out
}
