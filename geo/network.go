package geo

import (
	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// Options tunes how a Campus becomes a Network.
type Options struct {
	// SnapM is the distance in metres within which a pathway end joins another pathway
	// and a structure joins a pathway. Zero means DefaultSnapM.
	SnapM float64
	// MaxLateralM is the longest lateral in metres from a building (its footprint, or its
	// declared entrance) to the nearest point of a pathway, used when no pathway end meets the
	// footprint. Zero means DefaultMaxLateralM.
	MaxLateralM float64
	// NearMissM is how far from a dangling pathway end Build looks for a pathway or footprint
	// it just misses (Network.NearMisses), in metres. Zero means DefaultNearMissM.
	NearMissM float64
}

// DefaultSnapM and DefaultMaxLateralM are the Options defaults, in metres.
const (
	DefaultSnapM       = 0.5
	DefaultMaxLateralM = 30.0
)

// Junction kinds.
const (
	JunctionNode      = "node"      // where pathways meet, or a pathway end
	JunctionStructure = "structure" // a maintenance hole, handhole or pull box
	JunctionEntrance  = "entrance"  // a declared building entrance
)

// Junction is a vertex of the pathway network.
type Junction struct {
	ID            string // a structure's or entrance's id; where two spans of one run meet end to end and nothing else does, their ids joined by "+"; else "J" + a number in the order of the junctions' places
	Kind          string
	StructureType string // for JunctionStructure
	Point         orb.Point
}

// Span is a piece of one pathway between two junctions with no junction inside it.
type Span struct {
	ID         string // PathwayID when the pathway is one span, else PathwayID + "/" + 1-based piece number, from the line's west or south end (pieceOrder)
	PathwayID  string
	From, To   string // junction IDs
	LengthM    float64
	Type       string
	Status     string
	EMI        string
	Surface    string
	Method     string // MethodTrench or MethodBore, for new work along the span; MethodNone: none may be
	MethodSet  bool   // the campus gives the method (Pathway.MethodSet)
	Plenum     bool   // the span runs in a plenum (tray pathways only)
	Group      string
	SpareDucts int
	DuctMM     float64
	// BendsDeg holds the deflection angle in degrees at each interior vertex, from From to To
	// (0 is straight on, 90 a right-angle turn).
	BendsDeg []float64
	Line     orb.LineString // From → To
	// Beneath lists, in order from From to To, the buildings whose footprint the span runs
	// across for more than SnapM from wall to wall (a duct or direct-buried pathway drawn
	// under a building, or across it where it is entered at the walls): a route along the
	// span passes beneath them. A stretch from an end of the span inside a footprint is not
	// counted (the way in to a room).
	Beneath []string
	// Indoors lists, for a tunnel or tray span, each stretch of it from an end more than SnapM
	// inside a building's footprint back to where the span crosses that building's wall (the
	// whole span when it never does): a cable along it runs inside the building there, which
	// NFPA 70 770.48(A) counts from the point of entrance. A duct or buried span has none: its
	// cable emerges from the floor slab where it ends. Sorted by end (From first), then building.
	Indoors []IndoorEnd
	// Through lists, for a tunnel or tray span, the buildings whose footprint it runs across
	// from wall to wall for more than SnapM (a tunnel under a building's basement, entering at
	// one wall and leaving at another; a stretch from an end of the span inside a footprint is
	// in Indoors instead), in order from From to To, each with the metres inside: a cable
	// along it is inside that building there, from the wall where it enters (NFPA 70
	// 770.48(A) counts unlisted cable from its point of entrance), though the building is at
	// neither end. A duct or buried span has none: it runs beneath the floor slab (Beneath).
	Through []Crossing
	// near holds, for the From and the To end, how many vertices in from that end is the
	// first vertex that the line simplified within BendToleranceM keeps (bendsDeg); 0 for a
	// span not made by Build, taken as 1 (AwayFrom).
	near [2]int
}

// IndoorEnd is the stretch of a span inside a building's footprint from one of the span's ends
// (Span.Indoors).
type IndoorEnd struct {
	Building string
	AtTo     bool    // the stretch is at the span's To end, else at its From end
	LengthM  float64 // ellipsoidal metres from that end to the wall crossing; the span's LengthM when it crosses no wall
}

// Crossing is a building a span runs across from wall to wall, and the metres of the span
// inside its footprint there (Span.Through).
type Crossing struct {
	Building string
	LengthM  float64 // ellipsoidal metres inside the footprint, wall to wall
}

// IndoorM is the metres of the span inside building b from its To end (atTo) or its From end
// back to b's wall (Span.Indoors), and whether that end lies inside b at all.
func (s *Span) IndoorM(b string, atTo bool) (float64, bool) {
	for _, in := range s.Indoors {
		if in.Building == b && in.AtTo == atTo {
			return in.LengthM, true
		}
	}
	return 0, false
}

// Access says how a building reaches the network.
type Access struct {
	Building string
	Junction string
	// Via is ViaEntrance (a declared entrance), ViaFootprint (a pathway end on the footprint)
	// or ViaLateral (the nearest point of a pathway within MaxLateralM, made a junction).
	Via      string
	LateralM float64        // counted lateral length in metres; 0 unless Via is "lateral" or the entrance needed one
	Lateral  orb.LineString // the lateral's geometry, building side first; empty when LateralM is 0
}

// Warning is a non-fatal finding, such as two pathways that cross with no junction.
type Warning struct {
	File    string
	Feature string // "#index (id)" of the feature concerned, or "table name fid n (id)" (Source.Short)
	Message string
	// Slip marks a value the plan is made with that the campus likely did not mean: a number
	// that reads as typed in another unit (a duct_mm below any conduit's inside, a riser_m
	// above any building's), or a property not read for a slip in its name whose default is
	// planned instead ("riser" for riser_m: a riser of 15 m). A plan's terminal prints it in
	// full (route.Result.Shown), as written: it speaks of the campus's keys in their units.
	Slip bool
}

// Network is the noded pathway network: junctions and spans sorted by ID, one Access per
// building sorted by building ID, and the warnings met while building it.
//
// Beside them: every entrance of every building (Entrances, sorted by building ID then
// junction ID; a building's Access is one of its entrances), what meets at each junction
// (Meetings, parallel to Junctions), whether routes may pass through each building (Transit,
// sorted by building ID) and the dangling pathway ends that nearly reach something
// (NearMisses, by pathway ID, end, distance, kind and target).
type Network struct {
	Junctions  []Junction
	Spans      []Span
	Access     []Access
	Warnings   []Warning
	Entrances  []Entry
	Meetings   []Meeting
	Transit    []Transit
	NearMisses []NearMiss
	// Unjoined lists the buildings no pathway joins (no Access, no Entrances), by building
	// ID, each with why (an ErrUnreachable problem naming its feature). Such a building is
	// no problem of the campus: a plan that serves it is refused (package route), one that
	// does not is warned.
	Unjoined []Unjoined

	// Lookup maps set by Build; nil on a Network assembled by hand.
	spanIdx, junctionIdx, accessIdx map[string]int
}

// Unjoined is a building no pathway joins: none within MaxLateralM of its footprint or
// of an entrance, or its only pathway ends were dropped as noise.
type Unjoined struct {
	Building string
	Source   Source
	Reason   string // what is missing: "no pathway within 30 m of the footprint (design: max_lateral_m)"
}

// Problem is u as an input problem naming the building's feature (ErrUnreachable), with more
// said after the reason (what would fix it).
func (u Unjoined) Problem(more string) *input.Problem {
	return &input.Problem{File: u.Source.File, Feature: u.Source.Feature(u.Building), Err: problemf(ErrUnreachable, "%s%s", u.Reason, more)}
}

// Warning is u as a warning, with more said after the reason.
func (u Unjoined) Warning(more string) Warning {
	return Warning{File: u.Source.File, Feature: u.Source.Short(u.Building), Message: u.Reason + more}
}
