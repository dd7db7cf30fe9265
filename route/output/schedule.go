package output

import (
	"math"
	"strconv"
	"strings"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/items"
	"spanwright/route/routing"
	"spanwright/route/workbook"
)

// schedule is the cable schedule of one leg (scheduleOf), the one value links.csv's last
// columns (text) and bom.xlsx's links sheet (sheetCells) render, each in its own order: its
// cables, each cable's cut length (the cable bought of the leg's own construction, waste
// included: routing.CableTakeoff.OutsideLengthM, which is all of the links sheet's "cable
// bought" but with an entrance transition), the reels it takes, its slack loops' metres and
// the structures passed (the takeoff's), the jacket colour (JacketText) and the cables' labels
// (CableLabels); then, with an entrance transition (Leg.Inside), the inside cables and the
// piece each is cut to at the served building (to) and at the cross-connect (from), each
// where the transition has that end (Leg.InsideAt; blank at an end without), and their
// labels (InsideLabels). A cable's pieces add up to the cable bought: cut length + inside cut
// to + inside cut from, and over the legs to the bill's cable lines in either units
// (cableCut). An infeasible leg's schedule is blank, as many cells as a feasible one's.
type schedule struct {
	feasible, inside          bool
	insideTo, insideFrom      bool // the transition's ends: the served building's, the cross-connect's
	cables, reels, structures int
	cutM, slackM              float64
	jacket                    string
	labels                    []string
	insideCables              int
	insideToM, insideFromM    float64
	insideLabels              []string
}

// scheduleOf is the cable schedule of leg i of r.
func scheduleOf(r *route.Result, i int) schedule {
	l := &r.Legs[i]
	if !l.Feasible {
		return schedule{}
	}
	t := l.Cable
	return schedule{feasible: true, inside: l.Inside != "", insideTo: l.InsideAt.Has(media.EndA), insideFrom: l.InsideAt.Has(media.EndB), cables: len(t.Cables), reels: t.Reels, structures: t.Structures,
		cutM: t.OutsideLengthM(), slackM: t.SlackM(), jacket: JacketText(r, l), labels: CableLabels(r, i),
		insideCables: len(t.InsideCables), insideToM: t.InsideToM, insideFromM: t.InsideFromM, insideLabels: InsideLabels(r, i)}
}

// scheduleHead names links.csv's last columns, the cable schedule an installer cuts and
// labels cable by (schedule.text), after reason_code so that no earlier column moves; the
// inside pieces of an entrance transition last, after cable_label.
func scheduleHead(opt WriteOptions) []string {
	cutH, _ := opt.lengthCol("cut_length")
	slackH, _ := opt.lengthCol("slack_loops")
	toH, _ := opt.lengthCol("inside_cut_to")
	fromH, _ := opt.lengthCol("inside_cut_from")
	return []string{"cables", cutH, "reels", slackH, "structures_passed", "jacket_colour", "cable_label",
		"inside_cables", toH, fromH, "inside_labels"}
}

// text is s as links.csv's last columns (scheduleHead), lengths in the units of opt, labels
// separated by spaces; the inside cells empty without a transition, an end's cut empty
// where the transition has not that end, all empty for an infeasible leg.
func (s schedule) text(opt WriteOptions) []string {
	_, length := opt.lengthCol("")
	inside := []string{"", "", "", ""}
	if s.inside {
		inside = []string{strconv.Itoa(s.insideCables), "", "", strings.Join(s.insideLabels, " ")}
		if s.insideTo {
			inside[1] = length(s.insideToM)
		}
		if s.insideFrom {
			inside[2] = length(s.insideFromM)
		}
	}
	out := append([]string{strconv.Itoa(s.cables), length(s.cutM), strconv.Itoa(s.reels), length(s.slackM),
		strconv.Itoa(s.structures), s.jacket, strings.Join(s.labels, " ")}, inside...)
	if !s.feasible {
		return make([]string, len(out))
	}
	return out
}

// sheetCells is s as the last cells of the links sheet (its schedule columns: jacket colour,
// cable labels, cut length, inside cables, inside cuts and inside labels; the cables, reels,
// slack loops and structures passed are among the takeoff's cells before them), lengths in u
// to 0.1 as links.csv writes them, so that the sheet's pieces add up to the bill's cable
// lines as links.csv's do (cableCut); blank as text is empty.
func (s schedule) sheetCells(u Units) []workbook.Cell {
	inside := []workbook.Cell{workbook.Blank(), workbook.Blank(), workbook.Blank(), workbook.Blank()}
	if s.inside {
		inside = []workbook.Cell{workbook.Int(int64(s.insideCables)), workbook.Blank(), workbook.Blank(), workbook.Text(strings.Join(s.insideLabels, " "))}
		if s.insideTo {
			inside[1] = workbook.Number(u.Rounded(s.insideToM, 1), 1)
		}
		if s.insideFrom {
			inside[2] = workbook.Number(u.Rounded(s.insideFromM, 1), 1)
		}
	}
	out := append([]workbook.Cell{workbook.Text(s.jacket), workbook.Text(strings.Join(s.labels, " ")), workbook.Number(u.Rounded(s.cutM, 1), 1)}, inside...)
	if !s.feasible {
		return make([]workbook.Cell, len(out))
	}
	return out
}

// cableCut is the cable the schedule cuts for each cable line of the bill (by its price key),
// in tenths of the length unit of a run (a metre or a foot): over the feasible legs, cables ×
// cut_length of the leg's own construction and, with an entrance transition, inside_cables ×
// (inside_cut_to + inside_cut_from) of the inside one, each piece as links.csv and the links
// sheet write it (whole metres; in feet converted, to 0.1 ft). It is the one figure of cable
// bought by construction: the bill's cable lines in feet (bomUnit), the terminal's cable
// bought and bom.xlsx's and summary.json's total, so that the pieces add up to what the
// bill buys in feet as they do in metres (review 4 finding 9: converted one by one they came
// 4.1 ft short of the bill's riser line on 200 buildings).
type cableCut map[media.PriceKey]int64

// cutOf is the cableCut of r in the units of opt.
func cutOf(opt WriteOptions, r *route.Result) cableCut {
	u := UnitsOf(opt)
	tenths := func(m float64) int64 { return int64(math.Round(u.Rounded(m, 1) * 10)) }
	out := cableCut{}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		t := l.Cable
		// The bill's keys (items.Cable, as the estimate's legItems buys the cable).
		for _, lot := range t.Cables.Lots() {
			out[items.Cable(l.Medium, l.Construction, lot.Size.Count, true, 0).Price] += int64(lot.Cables) * tenths(t.OutsideLengthM())
		}
		if l.Inside != "" {
			for _, lot := range t.InsideCables.Lots() {
				out[items.Cable(l.Medium, l.Inside, lot.Size.Count, true, 0).Price] += int64(lot.Cables) * (tenths(t.InsideToM) + tenths(t.InsideFromM))
			}
		}
	}
	return out
}

// all is the cable cut of every construction, in the run's length unit.
func (c cableCut) all() float64 {
	var n int64
	for _, x := range c {
		n += x
	}
	return float64(n) / 10
}

// byConstruction is the cable cut of each medium and construction ("os2 ofnr-riser"), sizes
// together, in the run's length unit.
func (c cableCut) byConstruction() map[string]float64 {
	n := map[string]int64{}
	for k, x := range c {
		n[k.Medium+" "+k.Construction] += x
	}
	out := make(map[string]float64, len(n))
	for k, x := range n {
		out[k] = float64(x) / 10
	}
	return out
}

// JacketColours are the jacket colours of the cable leg l installs, as the catalog lists them
// for its construction and, with an entrance transition (Leg.Inside), for the inside one: the
// one decision on a leg's jacket, which links.csv, the links sheet (JacketText) and the report
// format. TIA-598-D gives jacket colours for premises cable by fibre type (yellow single-mode,
// aqua OM3/OM4, lime green OM5), which a construction takes from its medium unless the catalog
// gives its own; it sets none for outside plant, whose jackets are commonly black, as the
// catalog's outside-plant constructions say. "" where the catalog gives none (copper: TIA-598
// covers optical fibre only) or has no such medium or construction: a premises colour is not
// guessed for a construction the catalog does not know, which may be outside plant.
func JacketColours(r *route.Result, l *routing.Leg) (outside, inside string) {
	colour := func(construction string) string {
		if r.Engine == nil || construction == "" {
			return ""
		}
		m := r.Engine.Catalog().Medium(l.Medium)
		if m == nil {
			return ""
		}
		if c := m.Construction(construction); c != nil {
			return c.JacketColour
		}
		return ""
	}
	return colour(l.Construction), colour(l.Inside)
}

// JacketText is the jacket colours of a leg's cable (JacketColours) as links.csv and the links
// sheet write them, with an entrance transition the inside construction's too, as
// ConstructionText names them: "black + yellow at entrances", "black + yellow at CAF
// entrance" (Leg.TransitionText). "" where the catalog gives none.
func JacketText(r *route.Result, l *routing.Leg) string {
	out, inside := JacketColours(r, l)
	if inside != "" {
		out += " + " + inside + " " + l.TransitionText()
	}
	return out
}

// StrandsText is what a table in words gives as leg l's strands: the count for fibre,
// "N pairs" for a feasible copper leg, whose count is its pairs, 4 a cable (routing.Leg.StrandsCable).
// links.csv, routes.geojson and plan.gpkg give the number alone, documented as pairs for copper.
func StrandsText(cat *media.Catalog, l *routing.Leg) string {
	n := strconv.Itoa(l.StrandsCable)
	if m := cat.Medium(l.Medium); l.Feasible && m != nil && !m.Fibre() {
		return n + " pairs"
	}
	return n
}

// CableLabels are the labels of the cables of leg i of r, one per cable, written on the cable
// at both ends: the link's from and to buildings and a cable number, "ADM/LIB-1", after the
// form of ANSI/TIA-606's campus backbone cable identifier [b1-f1s1]/[b2-f2s2]-n without the
// floor and space, which the campus does not give (from memory). A link's cables are numbered
// from 1 over its legs in order (route.Result.Legs keeps a link's legs together, the primary
// first), so that no two cables of a link share a label.
func CableLabels(r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible || l.Link == nil {
		return nil
	}
	first := firstCable(r, i)
	out := make([]string, len(l.Cable.Cables))
	for j := range out {
		out[j] = cableLabel(l, first+j)
	}
	return out
}

// firstCable is the number of the first cable of leg i of r: 1 after the cables of the
// earlier legs of its link (CableLabels).
func firstCable(r *route.Result, i int) int {
	l := &r.Legs[i]
	first := 1
	for k := i - 1; k >= 0 && r.Legs[k].Link != nil && r.Legs[k].Link.ID == l.Link.ID; k-- {
		if r.Legs[k].Feasible {
			first += len(r.Legs[k].Cable.Cables)
		}
	}
	return first
}

// cableLabel is the label of cable n of leg l's link, "ADM/LIB-1".
func cableLabel(l *routing.Leg, n int) string {
	return l.Link.From + "/" + l.Link.To + "-" + strconv.Itoa(n)
}

// InsideLabels are the labels of the inside pieces of leg i of r with an entrance transition
// (Leg.Inside), nil without: each inside cable's piece at the served building, then each one's
// at the cross-connect, each where the transition has that end (Leg.TransitionAt), labelled as the cable it is spliced to (CableLabels, numbered alike
// from the leg's first cable, inside cables where their count differs) and ":" with the
// building it is in, "ADM/LIB-1:LIB" and "ADM/LIB-1:ADM", so that the three pieces of one
// channel read as one cable. Common practice, no published source: ANSI/TIA-606 labels a
// cable, not the pieces a transition splice makes of it (from memory).
func InsideLabels(r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible || l.Link == nil || l.Inside == "" {
		return nil
	}
	first := firstCable(r, i)
	at := l.TransitionAt()
	out := make([]string, 0, len(at)*len(l.Cable.InsideCables))
	for _, b := range at {
		for j := range l.Cable.InsideCables {
			out = append(out, cableLabel(l, first+j)+":"+b)
		}
	}
	return out
}
