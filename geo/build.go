package geo

import (
	"cmp"
	"context"
	"fmt"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// Access ways, the values of Access.Via.
const (
	ViaEntrance  = "entrance"
	ViaFootprint = "footprint"
	ViaLateral   = "lateral"
)

// JunctionPrefix starts the ID of a junction that is neither a structure nor an entrance.
const JunctionPrefix = "J"

// minCellM is the smallest cell of the spatial index, in metres.
const minCellM = 25.0

// Build nodes the campus's pathways into a Network.
//
// Pathways join where they share a vertex (within SnapM), where the end of one lies within
// SnapM of another (which is split there), and at structures: a structure within SnapM of a
// pathway becomes a junction there, with the structure's id; a vertex within SnapM that marks
// a place on its line (an end, a bend, a vertex another line shares) is preferred to a point
// between vertices. A junction's point is its structure's or entrance's, else where its
// pathways' ends meet, else a vertex two lines share, else a bend: a vertex on a straight run
// (within BendToleranceM of it) means nothing, and drawing one beside a junction moves no
// junction. A pathway joins itself only where its two ends meet. Pathways
// that cross with no shared vertex and no structure stay apart, and each such crossing is
// reported as a Warning. A piece of pathway shorter than 3×SnapM that leaves and returns to the
// same junction is dropped as noise.
//
// Each building gets one Access:
//  1. Via "entrance": a declared entrance within SnapM of a pathway is a junction; otherwise it
//     joins the nearest point of a pathway with a counted lateral of at most MaxLateralM. With
//     several entrances, one on a pathway wins (lowest junction ID), else the shortest lateral.
//  2. Via "footprint": a pathway end inside the footprint or within SnapM of its boundary; of
//     several, the junction with the most spans, then the lowest ID.
//  3. Via "footprint" too: where a pathway drawn across the footprint (both ends outside it)
//     crosses its boundary (wallDoors), every such place an entrance, never a point inside;
//  4. Via "lateral": the nearest point of any pathway within MaxLateralM of the footprint
//     (on a pole line, an aerial pathway, its nearest pole: a vertex, or where a pathway or
//     structure joins it), which becomes a junction (a vertex within SnapM of it that marks a place on the line is
//     used instead, so short spans are not cut off); the lateral runs from the nearest point of
//     the footprint boundary. The nearest point of a pathway of the other status (existing,
//     proposed) within MaxLateralM is an entrance too, by a lateral of its own. A counted
//     lateral's tap within tapMergeM along the run (across joints where pieces of the same
//     ducts meet end to end) of a junction already there moves to it (placeTaps).
//
// A building with none of these has no Access and no Entrances: it is listed in Unjoined
// with the ErrUnreachable *input.Problem that says why, and the rest of the network is built
// (a campus holds buildings no plan serves; whether one matters is the plan's to say).
//
// A pathway end more than SnapM inside a footprint that meets nothing there is cut back to
// where the pathway crosses the wall (cutAtWalls), with one Warning.
//
// Beside the Access, every way into a building is one of its Entrances: each declared
// entrance on a pathway or within MaxLateralM of one (each off the pathways gets its own
// counted lateral, and the place where it joins becomes a junction), and each pathway end on
// the footprint; the wall crossings of 3, or the lateral of 4, only when there is neither. A declared entrance beyond
// MaxLateralM of every pathway is a Warning when another entrance of its building reaches.
// So is every duct or direct-buried pathway drawn across a footprint (through), and each
// span records the buildings it runs beneath wall to wall (Span.Beneath).
// Build also lists what meets at each junction (Meetings), the pathways inside each building
// and whether routes may pass through it (Transit), warns about every pathway end that joins
// nothing, and lists those ends' near misses (NearMisses). All problems come back
// together as an *input.Problems. Snapping and intersection tests use an equirectangular projection
// around the campus's centre; every length is ellipsoidal (DistanceM). The result depends only
// on the input, byte for byte; junction numbers (JunctionPrefix + zero-padded number) follow
// the junctions' places on a grid coarser than a millimetre (junctionCellDeg), so reordering,
// renaming or reversing features, or moving every vertex by a millimetre, keeps every ID; a
// point where two pieces of one run meet end to end and nothing else does takes no number
// but the names of its two spans (joints), so splitting a pathway there keeps them too.
// Campuses across the
// ±180° meridian are not supported. Time is about O(n log n) in the number of vertices, using
// a grid index.
func Build(c *Campus, opt Options) (*Network, error) {
	return BuildContext(context.Background(), c, opt)
}

// BuildContext is Build that gives up when ctx is done, between its steps (noding, cutting,
// numbering, access, crossings), returning ctx's error.
func BuildContext(ctx context.Context, c *Campus, opt Options) (*Network, error) {
	if c == nil {
		return nil, fmt.Errorf("geo: build: nil campus")
	}
	snap, maxLat, nearMiss := opt.SnapM, opt.MaxLateralM, opt.NearMissM
	if snap == 0 {
		snap = DefaultSnapM
	}
	if maxLat == 0 {
		maxLat = DefaultMaxLateralM
	}
	if nearMiss == 0 {
		nearMiss = DefaultNearMissM
	}
	if !(snap > 0) || math.IsInf(snap, 0) || !(maxLat >= 0) || math.IsInf(maxLat, 0) || !(nearMiss > 0) || math.IsInf(nearMiss, 0) {
		return nil, fmt.Errorf("geo: build: bad options: SnapM %v, MaxLateralM %v and NearMissM %v must be finite and > 0",
			opt.SnapM, opt.MaxLateralM, opt.NearMissM)
	}
	b := &builder{c: c, snap: snap, maxLat: maxLat, nearMiss: nearMiss, warns: slices.Clone(c.warns)}
	if b.validate(); b.errs.Len() > 0 {
		return nil, &b.errs
	}
	steps := []func(){b.setup, b.joinVertices, b.joinEnds, b.joinStructures, b.joinEntrances, b.planAccess}
	if err := runSteps(ctx, steps); err != nil {
		return nil, err
	}
	if b.errs.Len() > 0 {
		return nil, &b.errs
	}
	n := &Network{}
	steps = []func(){b.cut, b.splitInside, b.number, func() { b.spans(n) }, func() { b.cutAtWalls(n) }, func() { b.junctions(n) }, func() { b.access(n) }, func() { b.entrances(n) }, func() { b.facts(n) }}
	if err := runSteps(ctx, steps); err != nil {
		return nil, err
	}
	if b.errs.Len() > 0 {
		return nil, &b.errs
	}
	if err := runSteps(ctx, []func(){b.crossings, b.selfCrossings, func() { n.Warnings = b.warnings() }, n.index}); err != nil {
		return nil, err
	}
	return n, nil
}

// runSteps runs steps in order, looking at ctx before each and after the last, and returns
// ctx's error as soon as it is done.
func runSteps(ctx context.Context, steps []func()) error {
	for _, step := range steps {
		if err := ctx.Err(); err != nil {
			return err
		}
		step()
	}
	return ctx.Err()
}

type memberKind uint8

const (
	memVertex memberKind = iota
	memSplit
	memStructure
	memEntrance
)

// member is a point that may become (part of) a junction: a pathway vertex, a split point on a
// pathway segment, a structure or an entrance.
type member struct {
	part  int     // index into builder.parts; -1 for structures and entrances
	seg   int     // vertex index, or segment index for a split point
	t     float64 // position along the segment for a split point, in (0, 1)
	ll    orb.Point
	xy    vec
	kind  memberKind
	ref   int  // structure or entrance index
	force bool // must become a junction (an access target)
}

// part is one line of one pathway.
type part struct {
	pw, k int // pathway index and line index within it
	ll    orb.LineString
	xy    []vec
	cum   []float64 // projected length from vertex 0 to each vertex, in metres
	bend  []bool    // per vertex: the line simplified within BendToleranceM keeps it (ends included)
	kept  []int32   // the vertices bend marks, in order
	v0    int       // member index of vertex 0; vertex i is member v0+i
	s0    int       // global index of segment 0
}

func (p *part) along(seg int, t float64) float64 {
	if t == 0 || seg >= len(p.cum)-1 {
		return p.cum[min(seg, len(p.cum)-1)]
	}
	return p.cum[seg] + t*(p.cum[seg+1]-p.cum[seg])
}

type segRef struct{ part, i int }

// entry is a junction position along a part.
type entry struct {
	seg   int
	t     float64
	m     int // member
	along float64
}

// piece is a stretch of a part between two junction positions: a future span.
type piece struct {
	part     int
	from, to int // roots
	pts      orb.LineString
}

type accessPlan struct {
	via      string
	target   int   // member; -1 for footprint until chosen
	cands    []int // footprint: end members
	from     orb.Point
	entrance int // entrance index for ViaEntrance
	lateral  bool
}

// door is one way into a building found while planning access: a declared entrance (on a
// pathway, or joined to one by a counted lateral from from), a pathway end on the footprint,
// or the counted lateral of a building with neither.
type door struct {
	via      string
	target   int // member
	entrance int // entrance index for ViaEntrance, else -1
	from     orb.Point
	lateral  bool
}

type warnRec struct {
	src Source
	id  string
	msg string
}

type builder struct {
	c            *Campus
	snap, maxLat float64
	nearMiss     float64
	errs         input.Problems
	unjoined     []Unjoined // buildings no pathway joins (unjoin)
	warns        []warnRec

	proj  projector
	cellM float64 // the grids' cell size, in metres
	// olines, when not nil, holds every line projected as setup would (overlaps made them on
	// the same lines), and segGrid already lists every segment as setup numbers them.
	olines  []oline
	parts   []part
	segs    []segRef
	segGrid *grid
	pws     []int // scratch: pathway indices (through)
	vtxGrid *grid
	mem     []member
	parent  []int
	labeled []bool
	splits  [][]int // per part
	shared  []bool  // per vertex member: another line has a vertex at exactly its position
	entIDs  []string
	entMem  []int
	entOn   []bool
	feet    []footprint
	plans   []accessPlan // per building, input order
	doors   [][]door     // per building, input order: every way in

	entries [][]entry // per part, kept junction positions
	pieces  []piece
	rep     map[int]orb.Point // root → junction point
	cutIn   map[string][]int  // pathway ID → the buildings (index) where cutAtWalls cut an end of it
	walled  map[int]bool      // buildings (index) entered where pathways drawn across them cross a wall (wallDoors)
	parted  map[int][][]int   // building index → the members splitInside parted, per meeting point
	ids     map[int]string    // root → junction ID
	taps    []tapReq          // counted laterals' taps planAccess found, for placeTaps
	runOf   []int             // per part: its run (runsOf), found at the first counted lateral
	spanID  []string          // per piece: its span's ID (spanIDs)
	// poleJoins holds the roots where two lines meet, as planAccess finds them (poleJoin).
	poleJoins map[int]bool
	aerialBuf []int32 // scratch: lateralPlace's segments of pole lines
	buf       []int32
	chords    [][3]int // scratch: lateralPlace's chords
}

func (b *builder) add(src Source, id, prop string, err error) {
	b.errs.Add(&input.Problem{File: src.File, Feature: src.Feature(id), Key: prop, Err: err})
}

// unjoin records that no pathway joins building bi, and why (format and args): the building
// gets no Access and no Entrances, and is listed in Network.Unjoined.
func (b *builder) unjoin(bi int, format string, args ...any) {
	bl := &b.c.Buildings[bi]
	b.unjoined = append(b.unjoined, Unjoined{Building: bl.ID, Source: bl.Source, Reason: fmt.Sprintf(format, args...)})
	b.doors[bi] = nil
}

func finite(p orb.Point) bool {
	return !math.IsNaN(p[0]) && !math.IsNaN(p[1]) && !math.IsInf(p[0], 0) && !math.IsInf(p[1], 0)
}

// validate rechecks what Parse guarantees, for campuses built by hand.
func (b *builder) validate() {
	c := b.c
	seen := make(map[string]bool)
	var buf orb.LineString // a line's distinct positions
	unique := func(src Source, id, kind string) {
		if id == "" {
			b.add(src, id, PropID, problemf(ErrMissingProperty, "missing; every %s needs a unique id", kind))
			return
		}
		if seen[kind+"\x00"+id] {
			b.add(src, id, PropID, problemf(ErrDuplicateID, "duplicate %s id %q", kind, id))
		}
		seen[kind+"\x00"+id] = true
	}
	for _, bl := range c.Buildings {
		unique(bl.Source, bl.ID, KindBuilding)
		for _, poly := range bl.Footprint {
			for _, r := range poly {
				for _, p := range r {
					if !finite(p) {
						b.add(bl.Source, bl.ID, "geometry", problemf(ErrBadGeometry, "coordinate is not a finite number"))
					}
				}
			}
		}
	}
	for _, pw := range c.Pathways {
		unique(pw.Source, pw.ID, KindPathway)
		if strings.Contains(pw.ID, "/") {
			b.add(pw.Source, pw.ID, PropID, problemf(ErrBadValue, `want a pathway id without "/" (span ids use it), got %q`, pw.ID))
		}
		if len(pw.Lines) == 0 {
			b.add(pw.Source, pw.ID, "geometry", problemf(ErrBadGeometry, "no lines"))
		}
		for _, ls := range pw.Lines {
			for _, p := range ls {
				if !finite(p) {
					b.add(pw.Source, pw.ID, "geometry", problemf(ErrBadGeometry, "coordinate is not a finite number"))
				}
			}
			if buf = dropRepeats(buf[:0], ls); len(buf) < 2 {
				b.add(pw.Source, pw.ID, "geometry", problemf(ErrBadGeometry, "want a line of at least two distinct positions"))
			}
		}
	}
	for _, s := range c.Structures {
		unique(s.Source, s.ID, "junction")
		if !finite(s.Point) {
			b.add(s.Source, s.ID, "geometry", problemf(ErrBadGeometry, "coordinate is not a finite number"))
		}
	}
	b.entIDs = EntranceIDs(c.Entrances)
	for i, e := range c.Entrances {
		unique(e.Source, b.entIDs[i], "junction")
		if !finite(e.Point) {
			b.add(e.Source, e.ID, "geometry", problemf(ErrBadGeometry, "coordinate is not a finite number"))
		}
		if !seen[KindBuilding+"\x00"+e.Building] {
			b.add(e.Source, e.ID, PropBuilding, problemf(ErrUnknownReference, "want the id of a building, got %q", e.Building))
		}
	}
}

// setup projects everything and indexes vertices and segments.
func (b *builder) setup() {
	b.project()
	if b.overlaps() { // copies dropped: project the campus without them, and look again
		b.project()
		b.overlaps()
	}
	c := b.c

	var stack [][2]int // markKept's scratch
	for pi, pw := range c.Pathways {
		for k, src := range pw.Lines {
			pt := part{pw: pi, k: k, v0: len(b.mem), s0: len(b.segs)}
			if b.olines != nil { // overlaps made this line, the same way, and indexed it
				l := &b.olines[len(b.parts)]
				pt.ll, pt.xy, pt.cum = l.ll, l.xy, l.cum
			} else {
				pt.ll, pt.xy, pt.cum = b.projectLine(src)
				for i := 1; i < len(pt.xy); i++ {
					b.segGrid.addSeg(pt.s0+i-1, pt.xy[i-1], pt.xy[i])
				}
			}
			ls := pt.ll
			for i, p := range ls {
				b.newMember(member{part: len(b.parts), seg: i, ll: p, xy: pt.xy[i], kind: memVertex}, false)
				b.vtxGrid.addPoint(pt.v0+i, pt.xy[i])
				if i > 0 {
					b.segs = append(b.segs, segRef{part: len(b.parts), i: i - 1})
				}
			}
			pt.bend = make([]bool, len(ls))
			stack = markKept(pt.xy, BendToleranceM, pt.bend, stack)
			for i, k := range pt.bend {
				if k {
					pt.kept = append(pt.kept, int32(i))
				}
			}
			b.parts = append(b.parts, pt)
		}
	}
	b.olines = nil
	b.shared = make([]bool, len(b.mem))
	b.splits = make([][]int, len(b.parts))
	b.feet = make([]footprint, len(c.Buildings))
	for i, bl := range c.Buildings {
		b.feet[i] = newFootprint(b.proj, bl.Footprint)
	}
}

// project sets the local projection about the centre of the bounding box of the campus's
// positions within FarM of its middle (middleOf), and the grids' cell size from that box's
// extent: a position farther out (refused on reading, possible in a campus built by hand)
// moves neither, so it changes no distance, lateral or route elsewhere.
func (b *builder) project() {
	c := b.c
	bound, ok := nearBound(c)
	b.proj = newProjector(bound)
	cell := minCellM
	if ok {
		lo, hi := b.proj.xy(bound.Min), b.proj.xy(bound.Max)
		cell = math.Max(minCellM, math.Max(hi.x-lo.x, hi.y-lo.y)/1024)
	}
	b.segGrid, b.vtxGrid, b.cellM = newGrid(cell), newGrid(cell), cell
}

// projectLine is line src with its repeated positions dropped (dropRepeats), on the local
// projection, with the projected length from its first position to each, in metres: how
// setup and overlaps both draw a line.
func (b *builder) projectLine(src orb.LineString) (ll orb.LineString, xy []vec, cum []float64) {
	ll = dropRepeats(make(orb.LineString, 0, len(src)), src)
	xy, cum = make([]vec, len(ll)), make([]float64, len(ll))
	for i, p := range ll {
		xy[i] = b.proj.xy(p)
		if i > 0 {
			cum[i] = cum[i-1] + xy[i].dist(xy[i-1])
		}
	}
	return ll, xy, cum
}

func (b *builder) newMember(m member, labeled bool) int {
	b.mem = append(b.mem, m)
	b.parent = append(b.parent, len(b.parent))
	b.labeled = append(b.labeled, labeled)
	return len(b.mem) - 1
}

func (b *builder) find(i int) int {
	for b.parent[i] != i {
		b.parent[i] = b.parent[b.parent[i]]
		i = b.parent[i]
	}
	return i
}

// union joins the clusters of x and y; it refuses (false) to join two clusters that each hold
// a structure or an entrance, since a junction has one name.
func (b *builder) union(x, y int) bool {
	rx, ry := b.find(x), b.find(y)
	if rx == ry {
		return true
	}
	if b.labeled[rx] && b.labeled[ry] {
		return false
	}
	if ry < rx {
		rx, ry = ry, rx
	}
	b.parent[ry] = rx
	b.labeled[rx] = b.labeled[rx] || b.labeled[ry]
	return true
}

func (b *builder) joinVertices() {
	s2 := b.snap * b.snap
	for pi := range b.parts {
		p := &b.parts[pi]
		for i, xy := range p.xy {
			m := p.v0 + i
			lo, hi := around(xy, b.snap)
			b.buf = b.vtxGrid.query(lo, hi, b.buf)
			for _, c := range b.buf {
				o := int(c)
				if o <= m || b.mem[o].part == pi {
					continue
				}
				if xy.dist2(b.mem[o].xy) <= s2 {
					b.union(m, o)
				}
				if b.mem[o].ll == b.mem[m].ll {
					b.shared[m], b.shared[o] = true, true
				}
			}
		}
		if n := len(p.xy); p.xy[0].dist2(p.xy[n-1]) <= s2 {
			b.union(p.v0, p.v0+n-1) // a closed loop
		}
	}
}

// marks reports whether vertex v of part p marks a place on its line: an end of the line, a
// vertex where the line bends (kept by its simplification within BendToleranceM), or one that
// another line shares exactly (a crossing drawn through a common vertex). A vertex that only
// lies on a straight run, within BendToleranceM of it, marks nothing: the line drawn without
// it is the same line, so noding must not take it for where something joins (locate, target)
// nor for a junction's point (cut).
func (b *builder) marks(p *part, v int) bool {
	return p.bend[v] || b.shared[p.v0+v]
}

// locate finds the place on part q nearest xy within tol among the listed segments: the
// nearest vertex within tol that marks a place on the line (marks), else a new split point.
// It returns the member, or -1.
func (b *builder) locate(q int, segIDs []int32, xy vec, tol float64) int {
	p := &b.parts[q]
	t2 := tol * tol
	bestV, bestVD := -1, math.Inf(1)
	bestS, bestST, bestSD := -1, 0.0, math.Inf(1)
	for _, s := range segIDs {
		i := b.segs[s].i
		for _, v := range [2]int{i, i + 1} {
			if d := xy.dist2(p.xy[v]); d <= t2 && d < bestVD && b.marks(p, v) {
				bestV, bestVD = v, d
			}
		}
		if t, d := closestOnSeg(xy, p.xy[i], p.xy[i+1]); d <= t2 && d < bestSD {
			bestS, bestST, bestSD = i, t, d
		}
	}
	switch {
	case bestV >= 0:
		return p.v0 + bestV
	case bestS < 0:
		return -1
	case bestST == 0: // the nearest place is a vertex that marks nothing: it, not a split on it
		return p.v0 + bestS
	case bestST == 1:
		return p.v0 + bestS + 1
	}
	return b.split(q, bestS, bestST)
}

func (b *builder) split(q, seg int, t float64) int {
	p := &b.parts[q]
	m := b.newMember(member{part: q, seg: seg, t: t, kind: memSplit,
		ll: lerpLL(p.ll[seg], p.ll[seg+1], t), xy: lerp(p.xy[seg], p.xy[seg+1], t)}, false)
	b.splits[q] = append(b.splits[q], m)
	return m
}

// nearParts lists, per part other than skip, the candidate segments within r of xy.
func (b *builder) nearParts(xy vec, r float64, skip int, fn func(q int, segIDs []int32)) {
	lo, hi := around(xy, r)
	b.buf = b.segGrid.query(lo, hi, b.buf)
	ids := append([]int32(nil), b.buf...)
	for i := 0; i < len(ids); {
		q := b.segs[ids[i]].part
		j := i
		for j < len(ids) && b.segs[ids[j]].part == q {
			j++
		}
		if q != skip {
			fn(q, ids[i:j])
		}
		i = j
	}
}

func (b *builder) joinEnds() {
	for pi := range b.parts {
		p := &b.parts[pi]
		for _, v := range [2]int{0, len(p.xy) - 1} {
			m := p.v0 + v
			b.nearParts(p.xy[v], b.snap, pi, func(q int, segIDs []int32) {
				if o := b.locate(q, segIDs, p.xy[v], b.snap); o >= 0 {
					b.union(m, o)
				}
			})
		}
	}
}

func (b *builder) joinStructures() {
	for si, s := range b.c.Structures {
		xy := b.proj.xy(s.Point)
		m := b.newMember(member{part: -1, ll: s.Point, xy: xy, kind: memStructure, ref: si}, true)
		joined := false
		b.nearParts(xy, b.snap, -1, func(q int, segIDs []int32) {
			if o := b.locate(q, segIDs, xy, b.snap); o >= 0 && b.union(m, o) {
				joined = true
			}
		})
		if !joined {
			b.warns = append(b.warns, warnRec{s.Source, s.ID,
				fmt.Sprintf("structure %q is not within %s m of any pathway (or another structure or entrance is there); it is not a junction", s.ID, fmtM(b.snap))})
		}
	}
}

func (b *builder) joinEntrances() {
	b.entMem = make([]int, len(b.c.Entrances))
	b.entOn = make([]bool, len(b.c.Entrances))
	for ei, e := range b.c.Entrances {
		xy := b.proj.xy(e.Point)
		m := b.newMember(member{part: -1, ll: e.Point, xy: xy, kind: memEntrance, ref: ei}, true)
		b.entMem[ei] = m
		b.nearParts(xy, b.snap, -1, func(q int, segIDs []int32) {
			if o := b.locate(q, segIDs, xy, b.snap); o >= 0 && b.union(m, o) {
				b.entOn[ei] = true
			}
		})
	}
}

// nearest returns the nearest place to xy within r where a counted lateral may join a
// pathway: its segment and parameter; on a pole line, its nearest pole (nearestPole), and
// the pole line passed over when none is within r.
func (b *builder) nearest(xy vec, r float64) (seg int, t, d float64, miss poleMiss, ok bool) {
	lo, hi := around(xy, r)
	b.buf = b.segGrid.query(lo, hi, b.buf)
	b.noTaps(func(a, c vec) float64 { _, d2 := closestOnSeg(xy, a, c); return math.Sqrt(d2) })
	best := place{seg: -1}
	aerial := b.aerialBuf[:0]
	for _, s := range b.buf {
		sr := b.segs[s]
		p := &b.parts[sr.part]
		if b.c.Pathways[p.pw].Type == TypeAerial {
			aerial = append(aerial, s)
			continue
		}
		tt, d2 := closestOnSeg(xy, p.xy[sr.i], p.xy[sr.i+1])
		if c := (place{seg: int(s), t: tt, d: math.Sqrt(d2)}); b.better(c, best) {
			best = c
		}
	}
	b.aerialBuf = aerial
	pole, miss := b.nearestPole(aerial, xy.dist, func(a, c vec) (float64, float64) {
		t, d2 := closestOnSeg(xy, a, c)
		return math.Sqrt(d2), t
	})
	if pole.seg >= 0 && b.better(pole, best) {
		best = pole
	}
	if best.seg < 0 || best.d > r {
		return 0, 0, 0, miss, false
	}
	return best.seg, best.t, best.d, miss, true
}

// noTaps drops from b.buf the segments of pathways nothing may be built on (method none: a
// conduit on a bridge, a casing under a railway): a counted lateral never taps one, as no
// duct is added beside it. It returns the nearest such pathway by dist and how far it is,
// for the problem that says why a building has no way in ("" when none was dropped).
func (b *builder) noTaps(dist func(a, c vec) float64) (string, float64) {
	held, heldM := "", math.Inf(1)
	kept := b.buf[:0]
	for _, s := range b.buf {
		sr := b.segs[s]
		p := &b.parts[sr.part]
		pw := &b.c.Pathways[p.pw]
		if pw.Method != MethodNone {
			kept = append(kept, s)
			continue
		}
		if d := dist(p.xy[sr.i], p.xy[sr.i+1]); d < heldM || (d == heldM && pw.ID < held) {
			held, heldM = pw.ID, d
		}
	}
	b.buf = kept
	return held, heldM
}

// place is a point on a pathway segment at distance d (projected metres) from something.
type place struct {
	seg  int
	t, d float64
}

// better orders candidate places by distance to the millimetre, then, on two lines, an
// existing pathway's before a proposed one's, then by position (west, then south, first),
// and on one line by exact distance, segment and
// position, so that ties depend neither on input order nor on the pathways' ids (renaming
// a pathway must not move a tap), and along one line the nearer place wins whatever the
// segment: a vertex drawn on a straight run numbers the segments after it anew, and its
// place within a millimetre of the nearest must not win on its segment's number.
func (b *builder) better(x, y place) bool {
	if y.seg < 0 {
		return true
	}
	if dx, dy := math.Round(x.d*1000), math.Round(y.d*1000); dx != dy {
		return dx < dy
	}
	if sx, sy := b.segs[x.seg], b.segs[y.seg]; sx.part != sy.part {
		px, py := &b.parts[sx.part], &b.parts[sy.part]
		if ex, ey := b.c.Pathways[px.pw].Status == StatusExisting, b.c.Pathways[py.pw].Status == StatusExisting; ex != ey {
			return ex // a duct in the ground before one not yet built
		}
		ax, ay := lerp(px.xy[sx.i], px.xy[sx.i+1], x.t), lerp(py.xy[sy.i], py.xy[sy.i+1], y.t)
		if ax.x != ay.x {
			return ax.x < ay.x
		}
		if ax.y != ay.y {
			return ax.y < ay.y
		}
		return sx.part < sy.part // the same point on two lines: either is the place
	}
	if x.d != y.d {
		return x.d < y.d
	}
	if x.seg != y.seg {
		return x.seg < y.seg
	}
	return x.t < y.t
}

// target turns a place on a pathway into a member that must become a junction, preferring
// the nearest vertex along the line within SnapM that marks a place on it (marks; the one
// before on a tie), so that no span shorter than SnapM is cut off between them; a vertex on a
// straight run there is passed over, as the line drawn without it would be.
func (b *builder) target(seg int, t float64) int {
	sr := b.segs[seg]
	p := &b.parts[sr.part]
	at := p.along(sr.i, t)
	v, best := -1, math.Inf(1)
	for k := sr.i; k >= 0 && at-p.cum[k] <= b.snap; k-- {
		if b.marks(p, k) {
			v, best = k, at-p.cum[k]
			break
		}
	}
	for k := sr.i + 1; k < len(p.cum) && p.cum[k]-at <= b.snap; k++ {
		if b.marks(p, k) {
			if p.cum[k]-at < best {
				v = k
			}
			break
		}
	}
	if v >= 0 {
		m := p.v0 + v
		b.mem[m].force = true
		return m
	}
	return b.placeAt(seg, t)
}

// placeAt turns a place on a pathway into a member that must become a junction there: the
// vertex at t 0 or 1, else a split point (the one another entrance's lateral made there).
func (b *builder) placeAt(seg int, t float64) int {
	sr := b.segs[seg]
	var m int
	switch {
	case t == 0 || t == 1: // a vertex that marks nothing: it, not a split on it
		m = b.parts[sr.part].v0 + sr.i + int(t)
	default:
		m = -1
		for _, o := range b.splits[sr.part] {
			if mo := b.mem[o]; mo.force && mo.seg == sr.i && mo.t == t {
				m = o // another entrance's lateral joins the same place
				break
			}
		}
		if m < 0 {
			m = b.split(sr.part, sr.i, t)
		}
	}
	b.mem[m].force = true
	return m
}

func (b *builder) planAccess() {
	c := b.c
	byBuilding := make(map[string][]int)
	for ei, e := range c.Entrances {
		byBuilding[e.Building] = append(byBuilding[e.Building], ei)
	}
	b.plans = make([]accessPlan, len(c.Buildings))
	b.doors = make([][]door, len(c.Buildings))
	for bi, bl := range c.Buildings {
		f := &b.feet[bi]
		var cands []int
		if !f.empty() {
			cands = b.footprintEnds(f)
		}
		for _, m := range cands {
			b.doors[bi] = append(b.doors[bi], door{via: ViaFootprint, target: m, entrance: -1})
		}
		if ents := byBuilding[bl.ID]; len(ents) > 0 {
			b.plans[bi] = b.planEntrance(bi, bl, ents)
			continue
		}
		if f.empty() {
			b.unjoin(bi, "no footprint and no entrance")
			continue
		}
		if len(cands) > 0 {
			b.plans[bi] = accessPlan{via: ViaFootprint, target: -1, cands: cands}
			continue
		}
		if walls := b.wallDoors(f); len(walls) > 0 {
			// A pathway drawn across the building (both ends outside): it is entered where
			// the pathway crosses its wall, as at a pathway end on the footprint, never at a
			// point inside it.
			for _, m := range walls {
				b.doors[bi] = append(b.doors[bi], door{via: ViaFootprint, target: m, entrance: -1})
			}
			b.plans[bi] = accessPlan{via: ViaFootprint, target: -1, cands: walls}
			if b.walled == nil {
				b.walled = make(map[int]bool)
			}
			b.walled[bi] = true
			continue
		}
		lo, hi := f.lo.sub(vec{b.maxLat, b.maxLat}), f.hi.add(vec{b.maxLat, b.maxLat})
		b.buf = b.segGrid.query(lo, hi, b.buf)
		held, heldM := b.noTaps(func(a, c vec) float64 { d, _ := f.segDist(a, c); return d })
		best, miss := b.lateralPlace(f, "")
		if best.seg < 0 || best.d > b.maxLat {
			also := ""
			if held != "" && heldM <= b.maxLat {
				also = fmt.Sprintf("; pathway %s passes %.1f m away, but its method is %q: nothing may be built on it, a lateral's tap included", held, heldM, MethodNone)
			}
			b.unjoin(bi, "no pathway within %s m of the footprint (design: max_lateral_m)%s%s", fmtM(b.maxLat), b.within(miss, b.maxLat), also)
			continue
		}
		b.plans[bi] = accessPlan{via: ViaLateral, target: -1}
		b.lateralDoors(bi, f, best)
	}
	b.placeTaps()
}

// lateralDoors adds the counted laterals of building bi (footprint f, no other way in): one
// to each run of pathway (runsOf) that passes within MaxLateralM of the footprint, at the
// place lateralPlace finds on that run, each a way in of its own priced by its length
// (items.Entrance, as every counted lateral). The optimizer chooses among them by cost, as
// among declared entrances. Not the nearest alone: a building standing between two streets
// about as far from each would be joined to whichever a millimetre, or on a tie the
// pathways' ids, made nearer, and its links routed from there (56 m of route against 266 m
// in one campus). Every run within reach, with no margin over the nearest: MaxLateralM is
// already the longest lateral the design allows, and a lateral some metres longer that
// saves a detour along the ducts, or taps an existing duct rather than a proposed one, is a
// choice a designer weighs by cost, which the optimizer does (the graph grows by about one
// junction and two spans per extra way in; README "Performance" gives the cost in time).
// A run is one place however it is split into pathways or lines, so a split adds none.
// nearest is the place on all the pathways near (lateralPlace), within reach; it is the only
// way in when no run's own place is within reach (a run's place about as near as its
// nearest, lateralTieM, may lie just beyond). The access plan (Network.Access, the way in
// the map draws) takes the nearest.
func (b *builder) lateralDoors(bi int, f *footprint, nearest place) {
	if b.runOf == nil {
		b.runOf = b.runsOf()
	}
	all := b.buf
	byRun := make(map[int][]int32)
	for _, s := range all {
		r := b.runOf[b.segs[s].part]
		byRun[r] = append(byRun[r], s)
	}
	runs := slices.Sorted(maps.Keys(byRun))
	xy := func(pl place) vec {
		sr := b.segs[pl.seg]
		p := &b.parts[sr.part]
		return lerp(p.xy[sr.i], p.xy[sr.i+1], pl.t)
	}
	var places []place
	for _, r := range runs {
		b.buf = byRun[r]
		pl, _ := b.lateralPlace(f, "")
		if pl.seg < 0 || pl.d > b.maxLat {
			continue
		}
		places = append(places, pl)
		// Every other pole of the run within reach is a way in too, as every run is: of two
		// poles about as far from the building, the one the lateral came down would follow the
		// line's drawing direction or a millimetre (tester 15 F1: 50 m of route on one link),
		// and with a margin over the nearest the same jump would come at the margin's edge
		// (review 21 F5). The optimizer chooses among them by cost.
		at := []vec{xy(pl)}
		for _, s := range byRun[r] {
			if b.c.Pathways[b.parts[b.segs[s].part].pw].Type != TypeAerial {
				continue
			}
			b.polesOf(s, func(c place, p vec) {
				if c.d = f.distTo(p); c.d <= b.maxLat && !slices.Contains(at, p) {
					at = append(at, p)
					places = append(places, c)
				}
			})
		}
	}
	b.buf = all
	if len(places) == 0 {
		places = append(places, nearest)
	}
	// The access plan: the nearest to the millimetre, then the place nearest the footprint's
	// centre, then the place west, then south, first (never the pathways' ids).
	centre := lerp(f.lo, f.hi, 0.5)
	mm := func(m float64) float64 { return math.Round(m * 1000) }
	first := 0
	for i, pl := range places {
		x, y := xy(pl), xy(places[first])
		if c := cmp.Or(cmp.Compare(mm(pl.d), mm(places[first].d)), cmp.Compare(mm(x.dist(centre)), mm(y.dist(centre))),
			cmp.Compare(x.x, y.x), cmp.Compare(x.y, y.y)); c < 0 {
			first = i
		}
	}
	for i, pl := range places {
		b.lateralDoor(bi, pl, i == first)
	}
}

// runsOf numbers the run each part (line) belongs to: the lowest index of the parts joined
// to it end to end through plain joints (jointsAt.plain), so that a pathway split at a
// vertex, or drawn as several pathways carrying the same ducts, is one run.
func (b *builder) runsOf() []int {
	up := make([]int, len(b.parts))
	for i := range up {
		up[i] = i
	}
	top := func(i int) int {
		for up[i] != i {
			up[i] = up[up[i]]
			i = up[i]
		}
		return i
	}
	jt := b.holds()
	for r, ps := range jt.ends {
		if !jt.plain(r) {
			continue
		}
		x, y := top(ps[0]), top(ps[1])
		if x > y {
			x, y = y, x
		}
		up[y] = x // the lower index is the run's number, whatever the order joined
	}
	out := make([]int, len(up))
	for i := range out {
		out[i] = top(i)
	}
	return out
}

// tapMergeM is how far apart along one run a counted lateral's tap and another place
// where something branches off it (a pathway that meets it, a structure, another lateral's
// tap) may lie and still be one handhole: the tap moves there (placeTaps). A handhole is a
// box of 1 to 2 m in the ground (README "Input"), so two branch points within 2 m enter one
// box, and setting two boxes closer is neither built nor bought (common practice, no
// published source).
const tapMergeM = 2.0

// tapReq is a counted lateral's tap before placeTaps places it: door of building bi, at the
// place seg, t on a pathway, the lateral running from the footprint (foot) or from the
// declared entrance at from.
type tapReq struct {
	bi, door int
	plan     bool // the building's access plan is this door
	seg      int
	t        float64
	at       vec // the place, projected
	foot     bool
	from     vec
}

// lateralDoor adds a door of building bi (which has no other way in) reached by a counted
// lateral from its footprint to place pl, placed later by placeTaps; plan says the building's
// access plan takes it.
func (b *builder) lateralDoor(bi int, pl place, plan bool) {
	b.doors[bi] = append(b.doors[bi], door{via: ViaLateral, target: -1, entrance: -1})
	b.taps = append(b.taps, b.tapAt(bi, len(b.doors[bi])-1, plan, pl.seg, pl.t, true, vec{}))
}

func (b *builder) tapAt(bi, door int, plan bool, seg int, t float64, foot bool, from vec) tapReq {
	sr := b.segs[seg]
	p := &b.parts[sr.part]
	return tapReq{bi: bi, door: door, plan: plan, seg: seg, t: t, at: lerp(p.xy[sr.i], p.xy[sr.i+1], t), foot: foot, from: from}
}

// jointsAt is what each junction holds, as placeTaps and runsOf read it: a part there
// (parts, -1 when two or more), a declared entrance and the parts with a line end there. plain says a junction is a plain joint: two pieces
// of one run meeting end to end with nothing else there (a pathway split at a vertex), which
// branches nothing.
type jointsAt struct {
	parts    map[int]int
	entrance map[int]bool
	ends     map[int][]int
	plain    func(r int) bool
}

// holds reads what every junction holds now (jointsAt).
func (b *builder) holds() jointsAt {
	parts := make(map[int]int, len(b.mem)/2) // root → a part there (-1 when two or more)
	entrance := make(map[int]bool)
	ends := make(map[int][]int) // root → the parts with a line end there
	mid := make(map[int]bool)   // root → some line passes there (not one of its ends)
	for i, m := range b.mem {
		r := b.find(i)
		switch {
		case m.kind == memEntrance:
			entrance[r] = true
		case m.part >= 0:
			if q, ok := parts[r]; !ok {
				parts[r] = m.part
			} else if q != m.part {
				parts[r] = -1
			}
			if m.kind == memVertex && (m.seg == 0 || m.seg == len(b.parts[m.part].xy)-1) {
				ends[r] = append(ends[r], m.part)
			} else {
				mid[r] = true
			}
		}
	}
	// A point where two pieces of one run meet end to end with nothing else there (a pathway
	// split at a vertex) branches nothing: a tap does not move to it, and the distance along
	// the run goes on through it into the next piece (alongRun), so that a split changes no
	// tap (the joints that junction numbering leaves unnumbered, joints).
	plain := func(r int) bool {
		ps := ends[r]
		if len(ps) != 2 || ps[0] == ps[1] || mid[r] || b.labeled[r] {
			return false
		}
		pa, pb := &b.c.Pathways[b.parts[ps[0]].pw], &b.c.Pathways[b.parts[ps[1]].pw]
		return sameDucts(pa.ductFacts(), pb.ductFacts())
	}
	return jointsAt{parts: parts, entrance: entrance, ends: ends, plain: plain}
}

// placeTaps turns every counted lateral's place into the member that becomes its junction.
// A place within tapMergeM along the run of a junction already there (a line's end, where
// another pathway or a structure joins, another lateral's tap) moves to that junction, the
// nearest; the run is followed across plain joints into the next piece (alongRun), so how a
// street is split into pathways or lines moves no tap, when the lateral stays within MaxLateralM: one handhole, or the structure there,
// serves both. Not to a junction on or within SnapM of a footprint (a way into a building).
// Otherwise target places it. The taps are placed west to east, then south to north, so a
// tap that moves to another's follows the places, not the features' order or ids.
func (b *builder) placeTaps() {
	reqs := b.taps
	b.taps = nil
	if len(reqs) == 0 {
		return
	}
	slices.SortStableFunc(reqs, func(x, y tapReq) int {
		return cmp.Or(cmp.Compare(x.at.x, y.at.x), cmp.Compare(x.at.y, y.at.y), cmp.Compare(x.bi, y.bi), cmp.Compare(x.door, y.door))
	})
	jt := b.holds()
	parts, entrance, ends, plain := jt.parts, jt.entrance, jt.ends, jt.plain
	junction := func(m int) bool { // m becomes a junction whatever the taps (cut's worthy) or is a tap's
		mm := b.mem[m]
		r := b.find(m)
		if entrance[r] {
			return false
		}
		if mm.force {
			return true
		}
		if plain(r) {
			return false
		}
		return parts[r] < 0 || b.labeled[r] || mm.kind == memVertex && (mm.seg == 0 || mm.seg == len(b.parts[mm.part].xy)-1)
	}
	limit := b.maxLat * (1 - 1e-3) // the lateral's length is checked on the ellipsoid (access): keep clear of it
	for _, q := range reqs {
		sr := b.segs[q.seg]
		p := &b.parts[sr.part]
		at := p.along(sr.i, q.t)
		best, bestD := -1, math.Inf(1)
		try := func(m int, d float64) {
			// To the micrometre, so that a run split at a vertex, whose lengths along add up
			// in another order, ties the same way.
			d = math.Round(d*1e6) / 1e6
			if d > tapMergeM || !junction(m) || (best >= 0 && (d > bestD || d == bestD && !lessLL(b.mem[m].ll, b.mem[best].ll))) {
				return
			}
			xy := b.mem[m].xy
			latM := xy.dist(q.from)
			if q.foot {
				latM = b.feet[q.bi].distTo(xy)
			}
			if latM > limit || b.nearFootprint(xy) {
				return
			}
			best, bestD = m, d
		}
		b.alongRun(sr.part, at, tapMergeM, ends, plain, func(pi int, dist func(float64) float64) {
			pp := &b.parts[pi]
			for v := range pp.xy {
				try(pp.v0+v, dist(pp.cum[v]))
			}
			for _, m := range b.splits[pi] {
				try(m, dist(pp.along(b.mem[m].seg, b.mem[m].t)))
			}
		})
		if best < 0 {
			// As target: the nearest vertex within SnapM along the run that marks a place on
			// it, so that no span shorter than SnapM is cut off, but not a plain joint on a
			// straight run, which the run drawn as one line does not have.
			snapD := math.Inf(1)
			b.alongRun(sr.part, at, b.snap, ends, plain, func(pi int, dist func(float64) float64) {
				pp := &b.parts[pi]
				for v := range pp.xy {
					m, d := pp.v0+v, math.Round(dist(pp.cum[v])*1e6)/1e6
					if d > b.snap || !b.marks(pp, v) || b.straightJoint(b.find(m), ends, plain) {
						continue
					}
					if best < 0 || d < snapD || d == snapD && lessLL(b.mem[m].ll, b.mem[best].ll) {
						best, snapD = m, d
					}
				}
			})
			if best < 0 {
				best = b.placeAt(q.seg, q.t)
			}
		}
		b.mem[best].force = true
		b.doors[q.bi][q.door].target = best
		if q.plan {
			b.plans[q.bi].target = best
		}
	}
}

// alongRun calls visit with part pi, whose place at along (metres from its vertex 0) is
// where a run is measured from, and with every part that continues it end to end through
// plain joints (two pieces of one run meeting with nothing else there: plain, ends as in
// placeTaps) up to withinM along the run from that place. dist turns a position along the
// visited part (metres from its vertex 0) into metres along the run from the place, so
// that how a run is split into pathways or lines does not change what lies within withinM.
// The parts of a run that closes on itself are visited once.
func (b *builder) alongRun(pi int, along, withinM float64, ends map[int][]int, plain func(r int) bool, visit func(pi int, dist func(float64) float64)) {
	visit(pi, func(a float64) float64 { return math.Abs(a - along) })
	start := &b.parts[pi]
	last := len(start.xy) - 1
	for _, end := range [2]int{0, last} {
		base := along // metres along the run from the place to the joint
		if end == last {
			base = start.cum[last] - along
		}
		cur, v := pi, end
		for steps := 0; base <= withinM && steps < len(b.parts); steps++ {
			r := b.find(b.parts[cur].v0 + v)
			if !plain(r) {
				break
			}
			next := ends[r][0]
			if next == cur {
				next = ends[r][1]
			}
			if next == pi {
				break
			}
			q := &b.parts[next]
			qLast := len(q.xy) - 1
			from := base
			if b.find(q.v0) == r {
				visit(next, func(a float64) float64 { return from + a })
				v = qLast
			} else {
				visit(next, func(a float64) float64 { return from + q.cum[qLast] - a })
				v = 0
			}
			base += q.cum[qLast]
			cur = next
		}
	}
}

// straightJoint reports whether root r is a plain joint (two pieces of one run meeting end
// to end, plain) where the run goes straight on: the joint lies within BendToleranceM of the
// chord between the kept vertices next to it on either piece, so the run drawn as one line
// would have no bend there (markKept's test, on the nearest kept vertices only).
func (b *builder) straightJoint(r int, ends map[int][]int, plain func(r int) bool) bool {
	if !plain(r) {
		return false
	}
	var near [2]vec
	var at vec
	for i, pi := range ends[r][:2] {
		p := &b.parts[pi]
		if b.find(p.v0) == r {
			at, near[i] = p.xy[0], p.xy[p.kept[1]]
		} else {
			at, near[i] = p.xy[len(p.xy)-1], p.xy[p.kept[len(p.kept)-2]]
		}
	}
	_, d2 := closestOnSeg(at, near[0], near[1])
	return d2 <= BendToleranceM*BendToleranceM
}

// nearFootprint reports whether xy lies in a footprint or within SnapM of one.
func (b *builder) nearFootprint(xy vec) bool {
	for i := range b.feet {
		f := &b.feet[i]
		if f.empty() || xy.x < f.lo.x-b.snap || xy.x > f.hi.x+b.snap || xy.y < f.lo.y-b.snap || xy.y > f.hi.y+b.snap {
			continue
		}
		if f.distTo(xy) <= b.snap {
			return true
		}
	}
	return false
}

// wallDoors lists, as members that must become junctions, every place where a pathway
// crosses the boundary of footprint f (a ring's edge, holes included), in segment order: the
// walls of a building that pathways are drawn across. A crossing within SnapM of a vertex
// that marks a place on the line takes that vertex (target).
func (b *builder) wallDoors(f *footprint) []int {
	ids := b.segGrid.query(f.lo, f.hi, nil)
	var out []int
	for _, s := range ids {
		sr := b.segs[s]
		p := &b.parts[sr.part]
		a, c := p.xy[sr.i], p.xy[sr.i+1]
		ts := f.crossings(a, c, nil)
		slices.Sort(ts)
		for _, t := range slices.Compact(ts) {
			if m := b.target(int(s), t); !slices.Contains(out, m) {
				out = append(out, m)
			}
		}
	}
	return out
}

// footprintEnds lists the pathway ends inside footprint f or within SnapM of its boundary, as
// members.
func (b *builder) footprintEnds(f *footprint) []int {
	var cands []int
	lo, hi := f.lo.sub(vec{b.snap, b.snap}), f.hi.add(vec{b.snap, b.snap})
	b.buf = b.vtxGrid.query(lo, hi, b.buf)
	for _, v := range b.buf {
		m := b.mem[v]
		if m.seg != 0 && m.seg != len(b.parts[m.part].xy)-1 {
			continue
		}
		if f.contains(m.xy) {
			cands = append(cands, int(v))
		} else if _, d := f.nearestBoundary(m.xy); d <= b.snap {
			cands = append(cands, int(v))
		}
	}
	return cands
}

// lateralPlace is where a counted lateral from footprint f joins the pathways among b.buf
// of the given status ("": any) (seg < 0 when none). The nearest pathway decides how far the lateral must reach; where it
// joins is the place about as near (within lateralTieM) that lies closest to the footprint's
// centre. A footprint edge parallel to a pathway is equally near all along it, and the
// nearest place alone would jump from one end of the edge to the other when a vertex moves by
// a millimetre. When no place about as near lies opposite the centre, the nearest place.
//
// Both are found on each line simplified within BendToleranceM, as turns and bends are
// measured, and brought back to the drawn line (chordPlace): a vertex on a straight run, or a
// run drawn with many, offers no place the run did not, and a short segment between two
// vertices that a file's last digit puts a hair off the line does not swing the place along
// it (a corner of the footprint 20 m away, projected on a segment of 10 cm whose ends are each
// 0.08 mm off, moves by 3 cm).
//
// A pole line (aerial) offers its poles only (nearestPole), never a place between two: the
// lateral comes down a pole. The nearer of that pole and the place on the other lines wins;
// the pole line passed over is returned for the problem when nothing is near enough.
func (b *builder) lateralPlace(f *footprint, status string) (place, poleMiss) {
	chords := b.chords[:0] // part, first and last kept vertex; a few per building
	aerial := b.aerialBuf[:0]
	for _, s := range b.buf {
		sr := b.segs[s]
		p := &b.parts[sr.part]
		if status != "" && b.c.Pathways[p.pw].Status != status {
			continue
		}
		if b.c.Pathways[p.pw].Type == TypeAerial {
			aerial = append(aerial, s) // a pole line is tapped at a pole only (nearestPole)
			continue
		}
		k, _ := slices.BinarySearch(p.kept, int32(sr.i)+1)
		if ch := [3]int{sr.part, int(p.kept[k-1]), int(p.kept[min(k, len(p.kept)-1)])}; !slices.Contains(chords, ch) {
			chords = append(chords, ch)
		}
	}
	b.chords, b.aerialBuf = chords, aerial
	pole, miss := b.nearestPole(aerial, f.distTo, f.segDist)
	best := b.chordsPlace(f, chords)
	if pole.seg >= 0 && b.better(pole, best) {
		return pole, miss
	}
	return best, miss
}

// chordsPlace is lateralPlace's place on the chords of lines other than pole lines (seg < 0
// when there are none).
func (b *builder) chordsPlace(f *footprint, chords [][3]int) place {
	nearest, nearestM := place{seg: -1}, math.Inf(1)
	for _, ch := range chords {
		p := &b.parts[ch[0]]
		_, t := f.segDist(p.xy[ch[1]], p.xy[ch[2]])
		c := b.chordPlace(p, ch[1], ch[2], t)
		c.d = f.distTo(lerp(p.xy[c.seg-p.s0], p.xy[c.seg-p.s0+1], c.t))
		if b.better(c, nearest) {
			nearest = c
		}
		nearestM = min(nearestM, c.d) // better ties places to the millimetre: not the limit
	}
	if nearest.seg < 0 {
		return nearest
	}
	centre := lerp(f.lo, f.hi, 0.5)
	// Of the places offered, the nearest the centre: by better, with the distance to the
	// centre for the distance to the footprint.
	best, bestX := place{seg: -1}, 0.0
	for _, ch := range chords {
		p := &b.parts[ch[0]]
		t, _ := closestOnSeg(centre, p.xy[ch[1]], p.xy[ch[2]])
		c := b.chordPlace(p, ch[1], ch[2], t)
		at := lerp(p.xy[c.seg-p.s0], p.xy[c.seg-p.s0+1], c.t)
		if c.d = f.distTo(at); c.d > nearestM+lateralTieM {
			continue // not about as near where it passes the centre (or not near at all)
		}
		x := at.dist(centre)
		if best.seg < 0 || b.better(place{seg: c.seg, t: c.t, d: x}, place{seg: best.seg, t: best.t, d: bestX}) {
			best, bestX = c, x
		}
	}
	if best.seg < 0 {
		return nearest
	}
	return best
}

// poleMiss is the nearest pole line a counted lateral passed over because it is tapped at a
// pole only: pathway pw runs spanM from the footprint (or entrance) and its nearest pole is
// poleM away (pw "" when no pole line was near). It names them when nothing is within
// MaxLateralM.
type poleMiss struct {
	pw           string
	pwi          int // the pathway's index
	spanM, poleM float64
	dist         func(vec) float64
}

// within is m when its pole line passes within r, with the nearest of all its poles (those
// of segments far off too, which nearestPole does not list), else no miss. It is asked only
// when nothing is within r.
func (b *builder) within(m poleMiss, r float64) poleMiss {
	if m.pw == "" || m.spanM > r {
		return poleMiss{}
	}
	for pi := range b.parts {
		if q := &b.parts[pi]; q.pw == m.pwi {
			for v, xy := range q.xy {
				if !b.wallEnd(q, v) {
					m.poleM = min(m.poleM, m.dist(xy))
				}
			}
		}
	}
	return m
}

// String says what the miss was, for the "no pathway within" problem; "" when none.
func (m poleMiss) String() string {
	if m.pw == "" {
		return ""
	}
	return fmt.Sprintf("; aerial pathway %s passes %.1f m away, but a lateral from a pole line comes down a pole, and its nearest pole is %.1f m away",
		m.pw, m.spanM, m.poleM)
}

// nearestPole is the nearest pole of the pole lines (aerial pathways) among segments ids, by
// dist (seg < 0 when there is none), and the nearest of those lines with its nearest pole.
// A counted lateral from a pole line leaves it at a pole, never from under the strand between
// two: the cable comes down the pole in a riser into the handhole at its foot (README,
// "Pathway types"). A pole stands at every vertex of an aerial pathway (a pole line is drawn
// pole to pole: the strand runs straight between two poles, so where the line is drawn to
// turn or not, a vertex is where it is held) and wherever another pathway or a structure
// joins it between two vertices (poleJoin); the line's end on a wall is the building's, no
// pole (wallEnd).
func (b *builder) nearestPole(ids []int32, dist func(vec) float64, segDist func(a, c vec) (float64, float64)) (place, poleMiss) {
	best := place{seg: -1}
	var miss poleMiss
	missPw, missD, missPole := -1, math.Inf(1), math.Inf(1)
	for _, s := range ids {
		sr := b.segs[s]
		p := &b.parts[sr.part]
		try := func(c place, xy vec) {
			c.d = dist(xy)
			if b.better(c, best) {
				best = c
			}
			if p.pw == missPw && c.d < missPole {
				missPole = c.d
			}
		}
		if d, _ := segDist(p.xy[sr.i], p.xy[sr.i+1]); d < missD || d == missD && p.pw != missPw && b.c.Pathways[p.pw].ID < b.c.Pathways[missPw].ID {
			if p.pw != missPw {
				missPole = math.Inf(1)
			}
			missPw, missD = p.pw, d
		}
		b.polesOf(s, try)
	}
	if missPw >= 0 {
		miss = poleMiss{pw: b.c.Pathways[missPw].ID, pwi: missPw, spanM: missD, poleM: missPole, dist: dist}
	}
	return best, miss
}

// polesOf calls fn with each pole of pole-line segment s (nearestPole: its vertices but an end
// on a wall, and where another line or a structure joins it between them) and where it
// stands. A pole at a vertex is offered by both segments that meet there.
func (b *builder) polesOf(s int32, fn func(c place, xy vec)) {
	sr := b.segs[s]
	p := &b.parts[sr.part]
	for _, v := range [2]int{sr.i, sr.i + 1} {
		if b.wallEnd(p, v) {
			continue
		}
		if v == len(p.xy)-1 {
			fn(place{seg: p.s0 + v - 1, t: 1}, p.xy[v])
		} else {
			fn(place{seg: p.s0 + v, t: 0}, p.xy[v])
		}
	}
	for _, m := range b.splits[sr.part] {
		if mm := b.mem[m]; mm.seg == sr.i && b.poleJoin(m) {
			fn(place{seg: int(s), t: mm.t}, mm.xy)
		}
	}
}

// wallEnd reports whether vertex v of part p is an end of its line on or within SnapM of a
// footprint: where a pole line ends on a wall the strand is fastened to the building, a way
// into it and no pole, so no lateral comes down there (a way into a building is no place to
// tap, as in placeTaps and poleJoin).
func (b *builder) wallEnd(p *part, v int) bool {
	return (v == 0 || v == len(p.xy)-1) && b.nearFootprint(p.xy[v])
}

// poleJoin reports whether split member m, between two vertices of a pole line, is a pole: a
// structure, or another line, joins it there (not a declared entrance alone: a way into a
// building is no place to tap).
func (b *builder) poleJoin(m int) bool {
	if b.poleJoins == nil {
		b.poleJoins = make(map[int]bool)
		first := make(map[int]int) // root → a part there
		for i, mm := range b.mem {
			ri := b.find(i)
			if mm.kind == memStructure {
				b.poleJoins[ri] = true
			}
			if mm.part < 0 {
				continue
			}
			if q, ok := first[ri]; !ok {
				first[ri] = mm.part
			} else if q != mm.part {
				b.poleJoins[ri] = true
			}
		}
	}
	return b.poleJoins[b.find(m)]
}

// chordPlace brings the point at t along the chord of part p from kept vertex k0 to k1 (its
// line simplified within BendToleranceM) back to the drawn line: the place on its segments
// k0 to k1 nearest that point (d unset).
func (b *builder) chordPlace(p *part, k0, k1 int, t float64) place {
	at := lerp(p.xy[k0], p.xy[k1], t)
	if k1 == k0+1 {
		return place{seg: p.s0 + k0, t: t}
	}
	j, tj, dj := k0, 0.0, math.Inf(1)
	for i := k0; i < k1; i++ {
		if ti, d2 := closestOnSeg(at, p.xy[i], p.xy[i+1]); d2 < dj {
			j, tj, dj = i, ti, d2
		}
	}
	return place{seg: p.s0 + j, t: tj}
}

// entranceOffM is how far a declared entrance may lie from its building's footprint before
// it is warned of (common practice, no published source: a surveyed wall point is within a
// metre of the drawn footprint).
const entranceOffM = 1.0

// entranceFarM is how far a declared entrance may lie from its building's footprint before
// planEntrance refuses it when another building's footprint is nearer to it, in metres: the
// longest lateral the design draws to a building (max_lateral_m), and never less than
// entranceOffM. Routes to such an entrance would leave the cable from it to the wall out of
// the bill and the loss budget, and the nearer building says what the slip is (tester 14
// F4: a GIS join that gave an entrance on a street 327 m away the wrong building id). With
// no building nearer (an entrance at a tunnel's end some metres off the wall, a design that
// draws short laterals) it is refused only beyond entranceStrayM, warned of below (review
// 20 F2: max_lateral_m, a design setting, refused a campus a sweep over it planned).
func (b *builder) entranceFarM() float64 { return max(b.maxLat, entranceOffM) }

// entranceStrayM is how far a declared entrance may lie from its building's footprint at
// most, whatever else is near: a mistyped position (common practice, no published source).
const entranceStrayM = 100.0

// otherFoot returns the building other than bi whose footprint is nearest to xy within r
// metres, and its distance; -1 when none is.
func (b *builder) otherFoot(bi int, xy vec, r float64) (int, float64) {
	best, bestD := -1, math.Inf(1)
	for i := range b.feet {
		f := &b.feet[i]
		if i == bi || f.empty() || xy.x < f.lo.x-r || xy.x > f.hi.x+r || xy.y < f.lo.y-r || xy.y > f.hi.y+r {
			continue
		}
		if d := f.distTo(xy); d <= r && d < bestD {
			best, bestD = i, d
		}
	}
	return best, bestD
}

// nearerFoot reports whether the footprint of a building other than bi is nearer than d to xy.
func (b *builder) nearerFoot(bi int, xy vec, d float64) bool {
	i, di := b.otherFoot(bi, xy, d)
	return i >= 0 && di < d
}

// entranceSlip names the likely slip of an entrance at xy too far from building bi: the
// building whose footprint it lies on, or nearest within entranceFarM (the wrong building
// id); or, with none that near, a mistyped position.
func (b *builder) entranceSlip(bi int, xy vec) string {
	r := b.entranceFarM()
	best, bestD := b.otherFoot(bi, xy, r)
	if best < 0 {
		return fmt.Sprintf("; no building's footprint is within %s m of it: a mistyped position, or the wrong building id?", fmtM(r))
	}
	other := b.c.Buildings[best]
	if bestD <= entranceOffM {
		return fmt.Sprintf("; it lies on the wall of building %q (%s): the wrong building id?", other.ID, other.Source)
	}
	return fmt.Sprintf("; building %q (%s) is %.1f m from it: the wrong building id?", other.ID, other.Source, bestD)
}

// planEntrance makes every declared entrance of the building a door (one off the pathways
// joins the nearest place on one, within MaxLateralM, by a counted lateral) and chooses the
// Access among them: one on a pathway (lowest junction ID), else the shortest lateral (to the
// millimetre, then the lowest ID).
func (b *builder) planEntrance(bi int, bl Building, ents []int) accessPlan {
	on := -1
	for _, ei := range ents {
		if b.entOn[ei] && (on < 0 || b.entIDs[ei] < b.entIDs[on]) {
			on = ei
		}
	}
	best, bestE, bestTap := math.Inf(1), -1, -1
	if f := &b.feet[bi]; !f.empty() {
		// An entrance is where cables go through the building's wall. One declared away from
		// the footprint (a mistyped coordinate, another building's id) ends every route
		// there, the cable, the loss budget and the bill short of the building: say so.
		// One declared inside the footprint takes routes that far into the building, counted
		// as outside plant (route, cable, trench): say so too.
		for _, ei := range ents {
			xy, e := b.mem[b.entMem[ei]].xy, b.c.Entrances[ei]
			if d := f.distTo(xy); d > max(b.entranceFarM(), entranceStrayM) || (d > b.entranceFarM() && b.nearerFoot(bi, xy, d)) {
				b.add(e.Source, b.entIDs[ei], PropBuilding, problemf(ErrBadValue,
					"entrance %q is %.1f m from the footprint of its building %q, farther than the longest lateral the design draws to a building (%s m, design: max_lateral_m): an entrance is where cable goes through its building's wall, and routes to this one would end %.1f m short of it%s",
					b.entIDs[ei], d, bl.ID, fmtM(b.entranceFarM()), d, b.entranceSlip(bi, xy)))
			} else if d > entranceOffM {
				b.warns = append(b.warns, warnRec{e.Source, b.entIDs[ei], fmt.Sprintf(
					"entrance %q of building %q is %.1f m from the building's footprint: routes to it end there, and the cable from it to the wall is not counted; move it to the wall, or check its building",
					b.entIDs[ei], bl.ID, d)})
			} else if _, in := f.nearestBoundary(xy); d == 0 && in > entranceOffM {
				b.warns = append(b.warns, warnRec{e.Source, b.entIDs[ei], fmt.Sprintf(
					"entrance %q of building %q is %.1f m inside the building's footprint: routes to it run that far into the building and count it as outside plant (route, cable, trench); move it to the wall",
					b.entIDs[ei], bl.ID, in)})
			}
		}
	}
	for _, ei := range ents {
		if b.entOn[ei] {
			b.doors[bi] = append(b.doors[bi], door{via: ViaEntrance, target: b.entMem[ei], entrance: ei})
			continue
		}
		seg, t, d, miss, ok := b.nearest(b.mem[b.entMem[ei]].xy, b.maxLat)
		if !ok {
			e := b.c.Entrances[ei]
			b.warns = append(b.warns, warnRec{e.Source, b.entIDs[ei], fmt.Sprintf(
				"entrance %q of building %q is not within %s m (design: max_lateral_m) of any pathway%s; it is not an entrance",
				b.entIDs[ei], bl.ID, fmtM(b.maxLat), b.within(miss, b.maxLat))})
			continue
		}
		b.doors[bi] = append(b.doors[bi], door{via: ViaEntrance, target: -1, entrance: ei, from: b.c.Entrances[ei].Point, lateral: true})
		b.taps = append(b.taps, b.tapAt(bi, len(b.doors[bi])-1, false, seg, t, false, b.mem[b.entMem[ei]].xy))
		if bestE < 0 || math.Round(d*1000) < math.Round(best*1000) ||
			(math.Round(d*1000) == math.Round(best*1000) && b.entIDs[ei] < b.entIDs[bestE]) {
			best, bestE, bestTap = d, ei, len(b.taps)-1
		}
	}
	if on >= 0 {
		return accessPlan{via: ViaEntrance, target: b.entMem[on], entrance: on}
	}
	if bestE < 0 {
		b.unjoin(bi, "no pathway within %s m of its entrance (design: max_lateral_m)", fmtM(b.maxLat))
		return accessPlan{}
	}
	b.taps[bestTap].plan = true // placeTaps sets the target
	return accessPlan{via: ViaEntrance, target: -1, entrance: bestE,
		from: b.c.Entrances[bestE].Point, lateral: true}
}

// cut finds the junction positions along every part and the pieces between them.
func (b *builder) cut() {
	multi := make(map[int]bool)
	firstPart := make(map[int]int)
	for i, m := range b.mem {
		if m.part < 0 {
			continue
		}
		r := b.find(i)
		if fp, ok := firstPart[r]; !ok {
			firstPart[r] = m.part
		} else if fp != m.part {
			multi[r] = true
		}
	}
	worthy := func(i int) bool {
		m := b.mem[i]
		r := b.find(i)
		if m.force || multi[r] || b.labeled[r] {
			return true
		}
		return m.kind == memVertex && (m.seg == 0 || m.seg == len(b.parts[m.part].xy)-1)
	}

	// A junction's point is where the drawing has its pathways meet: its structure's or
	// entrance's point; else its westernmost (then southernmost) pathway end (the end of an
	// input line); else such a vertex shared exactly by two lines (a crossing drawn through a
	// common vertex); else such a vertex where a line bends; else such a vertex of any kind;
	// else such a split point. A vertex on a straight run that comes within SnapM of the
	// others joins the group but is where nothing meets: drawn or not, the junction stays put.
	b.rep = make(map[int]orb.Point)
	named := make(map[int]bool)
	rank := make(map[int]int)
	for i, m := range b.mem {
		if m.part < 0 {
			r := b.find(i)
			b.rep[r], named[r] = m.ll, true
		}
	}
	for i, m := range b.mem {
		r := b.find(i)
		if m.part < 0 || named[r] {
			continue
		}
		k := b.repRank(i)
		cur, has := b.rep[r]
		if !has || k < rank[r] || (k == rank[r] && lessLL(m.ll, cur)) {
			b.rep[r], rank[r] = m.ll, k
		}
	}

	b.entries = make([][]entry, len(b.parts))
	three := 3 * b.snap
	for pi := range b.parts {
		p := &b.parts[pi]
		var es []entry
		for v := range p.xy {
			if worthy(p.v0 + v) {
				es = append(es, entry{seg: v, m: p.v0 + v, along: p.cum[v]})
			}
		}
		for _, m := range b.splits[pi] {
			if worthy(m) {
				mm := b.mem[m]
				es = append(es, entry{seg: mm.seg, t: mm.t, m: m, along: p.along(mm.seg, mm.t)})
			}
		}
		sort.Slice(es, func(i, j int) bool {
			if es[i].seg != es[j].seg {
				return es[i].seg < es[j].seg
			}
			if es[i].t != es[j].t {
				return es[i].t < es[j].t
			}
			return es[i].m < es[j].m
		})
		kept := es[:0]
		for _, e := range es {
			if n := len(kept); n > 0 && kept[n-1].seg == e.seg && kept[n-1].t == e.t && b.find(kept[n-1].m) == b.find(e.m) {
				continue
			}
			kept = append(kept, e)
		}
		b.entries[pi] = kept
		for k := 1; k < len(kept); k++ {
			e1, e2 := kept[k-1], kept[k]
			r1, r2 := b.find(e1.m), b.find(e2.m)
			if r1 == r2 && e2.along-e1.along < three {
				continue
			}
			// Within SnapM of either end (along the line) the junction's point stands for the
			// drawing, as it does for the group's own members: a vertex there on a straight run
			// (one that marks nothing) is left out, so that the piece runs from the junction's
			// point to the line as it would without it.
			pts := orb.LineString{b.rep[r1]}
			j1 := e2.seg
			if e2.t == 0 {
				j1--
			}
			for j := e1.seg + 1; j <= j1; j++ {
				if !b.marks(p, j) && (p.cum[j]-e1.along <= b.snap || e2.along-p.cum[j] <= b.snap) {
					continue
				}
				pts = append(pts, p.ll[j])
			}
			pts = append(pts, b.rep[r2])
			b.pieces = append(b.pieces, piece{part: pi, from: r1, to: r2, pts: b.clean(pts)})
		}
	}
}

// repRank orders a pathway member's claim to be its junction's point (cut), lowest first:
// a line's end, a vertex shared exactly with another line, a bend, another vertex, a split
// point.
func (b *builder) repRank(i int) int {
	m := b.mem[i]
	p := &b.parts[m.part]
	switch {
	case m.kind != memVertex:
		return 4
	case m.seg == 0 || m.seg == len(p.xy)-1:
		return 0
	case b.shared[i]:
		return 1
	case p.bend[m.seg]:
		return 2
	}
	return 3
}

// clean drops vertices within a millimetre of the one before (keeping both ends), so that
// bends are not measured on specks.
func (b *builder) clean(pts orb.LineString) orb.LineString {
	out := pts[:1]
	for i := 1; i < len(pts); i++ {
		last := i == len(pts)-1
		if b.proj.xy(pts[i]).dist(b.proj.xy(out[len(out)-1])) < 1e-3 {
			if last && len(out) > 1 {
				out[len(out)-1] = pts[i]
			}
			continue
		}
		out = append(out, pts[i])
	}
	if len(out) == 1 {
		out = append(out, pts[len(pts)-1])
	}
	return out
}

// endFirst reports whether a line from a to z is numbered from z: from its west end when it
// runs more east-west than north-south (its ends' longitudes apart, scaled by the cosine of
// the latitude, at least their latitudes), else from its south end. Which axis decides
// follows the line's bearing, not a coordinate that another CRS moves by a hair: a street
// drawn due north in a projected CRS is a little off north in longitude and latitude, and
// numbering it by the longitude of its ends (as before) renamed its pieces when the campus
// was reprojected (TestDemoReprojectedPlansSameRoutes).
func endFirst(z, a orb.Point) bool {
	dx := math.Abs(z[0]-a[0]) * math.Cos((a[1]+z[1])/2*math.Pi/180)
	dy := math.Abs(z[1] - a[1])
	if dx >= dy {
		return lessLL(z, a)
	}
	if z[1] != a[1] {
		return z[1] < a[1]
	}
	return z[0] < a[0]
}

func lessLL(a, b orb.Point) bool {
	if a[0] != b[0] {
		return a[0] < b[0]
	}
	return a[1] < b[1]
}

// Junction numbering (number): unnamed junctions are numbered in cells of junctionCellDeg
// of longitude and latitude, west to east by column, south to north within a column, and
// within one cell along junctionSkew (about 7° north of east). A cell's edges lie a third of a
// cell past each multiple of junctionCellDeg, so that a coordinate given to 7 decimals or
// fewer lies at least 3.3e-8° from one (3.7 mm north–south; east–west 3.7 mm × the cosine of
// the latitude, 2 mm at 57°): a junction moved by a millimetre or so (a re-export, a
// reprojection round trip) keeps its cell, and within a cell two junctions a snap apart are
// not ordered by a coordinate they nearly share (a north–south street's junctions share a
// longitude; ordered by it, as before, a millimetre renumbered them: tester 10, F7).
const (
	junctionCellDeg = 1e-4
	junctionSkew    = 8.0 // within a cell, by junctionSkew × metres east + metres north
)

// numPlace is a point's cell of the numbering grid and its place within the cell along
// junctionSkew (see junctionCellDeg).
type numPlace struct {
	lon, lat int64
	skew     float64
}

// placeOf is p's place on the numbering grid.
func placeOf(p orb.Point) numPlace {
	fx, fy := p[0]/junctionCellDeg-1.0/3, p[1]/junctionCellDeg-1.0/3
	cx, cy := math.Floor(fx), math.Floor(fy)
	east := (fx - cx) * math.Cos((cy+1.0/3)*junctionCellDeg*math.Pi/180) // in cells of latitude, as north is
	return numPlace{int64(cx), int64(cy), junctionSkew*east + (fy - cy)}
}

// cmpPlaces orders two places as junctions and entrances are numbered.
func cmpPlaces(a, c numPlace) int {
	return cmp.Or(cmp.Compare(a.lon, c.lon), cmp.Compare(a.lat, c.lat), cmp.Compare(a.skew, c.skew))
}

// joints returns the junctions (by root) where two pieces of one run meet end to end and
// nothing else does: exactly two piece ends, of two pieces that carry the same ducts
// (sameDucts; two lines of one pathway do), no structure, entrance or access there. Such a
// point is where a GIS split a line, no place in the ground: it takes no number, and is named
// by the spans that meet there (jointName), so that splitting a pathway at a vertex renames
// no junction. A name that another joint or an input id already has leaves its joint
// numbered as other junctions are.
func (b *builder) joints(used map[int]bool, declared map[string]bool) map[int]string {
	ends := make(map[int][]int) // root → the pieces with an end there
	for k, pc := range b.pieces {
		ends[pc.from] = append(ends[pc.from], k)
		ends[pc.to] = append(ends[pc.to], k)
	}
	door := make(map[int]bool)
	for _, ds := range b.doors {
		for _, d := range ds {
			if d.target >= 0 {
				door[b.find(d.target)] = true
			}
		}
	}
	names := make(map[int]string)
	count := make(map[string]int)
	for r, ks := range ends {
		if !used[r] || b.labeled[r] || door[r] || len(ks) != 2 || ks[0] == ks[1] {
			continue
		}
		if _, named := b.ids[r]; named {
			continue
		}
		pa, pb := &b.c.Pathways[b.parts[b.pieces[ks[0]].part].pw], &b.c.Pathways[b.parts[b.pieces[ks[1]].part].pw]
		if !sameDucts(pa.ductFacts(), pb.ductFacts()) {
			continue
		}
		name := jointName(b.spanID[ks[0]], b.spanID[ks[1]])
		names[r] = name
		count[name]++
	}
	for r, name := range names {
		if count[name] > 1 || declared[name] {
			delete(names, r)
		}
	}
	return names
}

// jointName names the point where spans x and y meet end to end (joints): their ids, the
// lower first, joined by "+".
func jointName(x, y string) string {
	if y < x {
		x, y = y, x
	}
	return x + "+" + y
}

// number names every junction that a piece or an access uses: a structure's or entrance's
// id, a joint's name (joints), else JunctionPrefix and a number in the order of the numbering
// grid (junctionCellDeg).
func (b *builder) number() {
	used := make(map[int]bool)
	for _, pc := range b.pieces {
		used[pc.from], used[pc.to] = true, true
	}
	for _, ds := range b.doors { // every plan's target is a door
		for _, d := range ds {
			if d.via != ViaFootprint {
				used[b.find(d.target)] = true
			}
		}
	}
	b.ids = make(map[int]string)
	declared := make(map[string]bool)
	for _, bl := range b.c.Buildings {
		declared[bl.ID] = true
	}
	for _, pw := range b.c.Pathways {
		declared[pw.ID] = true
	}
	for _, s := range b.c.Structures {
		declared[s.ID] = true
	}
	for _, id := range b.entIDs {
		declared[id] = true
	}
	for i, m := range b.mem {
		r := b.find(i)
		if !used[r] {
			continue
		}
		switch m.kind {
		case memStructure:
			b.ids[r] = b.c.Structures[m.ref].ID
		case memEntrance:
			b.ids[r] = b.entIDs[m.ref]
		}
	}
	b.spanID = b.spanIDs()
	for r, name := range b.joints(used, declared) {
		b.ids[r] = name
	}
	type unnamed struct {
		root int
		at   numPlace
		tie  string
	}
	tie := make(map[int]string)
	for i, m := range b.mem {
		r := b.find(i)
		if !used[r] || m.part < 0 {
			continue
		}
		if _, named := b.ids[r]; named {
			continue
		}
		p := b.parts[m.part]
		k := fmt.Sprintf("%s\x00%09d\x00%09d\x00%.12f", b.c.Pathways[p.pw].ID, p.k, m.seg, m.t)
		if cur, ok := tie[r]; !ok || k < cur {
			tie[r] = k
		}
	}
	var list []unnamed
	for r := range used {
		if _, named := b.ids[r]; named {
			continue
		}
		list = append(list, unnamed{r, placeOf(b.rep[r]), tie[r]})
	}
	slices.SortFunc(list, func(a, c unnamed) int {
		return cmp.Or(cmpPlaces(a.at, c.at), strings.Compare(a.tie, c.tie), cmp.Compare(a.root, c.root))
	})
	// Numbers skip the input ids of their form; how many pathways there are (a split adds
	// one) changes no number's width.
	skip := 0
	for id := range declared {
		if rest, ok := strings.CutPrefix(id, JunctionPrefix); ok && rest != "" && strings.Trim(rest, "0123456789") == "" {
			skip++
		}
	}
	width := max(4, len(strconv.Itoa(len(list)+skip)))
	n := 0
	for _, u := range list {
		var id string
		for {
			n++
			id = JunctionPrefix + fmt.Sprintf("%0*d", width, n)
			if !declared[id] {
				break
			}
		}
		b.ids[u.root] = id
	}
}

// spanIDs is each piece's span ID (Span.ID), by index into b.pieces: the pathway's id, with
// "/" and the piece's number along it (pieceOrder) when the pathway is several spans.
func (b *builder) spanIDs() []string {
	count := make(map[int]int)
	for _, pc := range b.pieces {
		count[b.parts[pc.part].pw]++
	}
	seq := make(map[int]int)
	ids := make([]string, len(b.pieces))
	for _, i := range b.pieceOrder() {
		pw := b.parts[b.pieces[i].part].pw
		id := b.c.Pathways[pw].ID
		if count[pw] > 1 {
			seq[pw]++
			id += "/" + strconv.Itoa(seq[pw])
		}
		ids[i] = id
	}
	return ids
}

// pieceOrder lists the pieces in the order their pathways number them (Span.ID's piece
// number): whatever the direction a line is drawn in, its pieces from its west end when the
// line runs more east-west than north-south, else from its south end (endFirst; a closed line
// from its first point toward the neighbour endFirst puts first), and a pathway's lines by
// those ends; so reversing a line, or the lines of a MultiLineString, renames no span.
func (b *builder) pieceOrder() []int {
	type key struct {
		first, last orb.Point // the line's ends, in the order it is numbered
		k           int       // the line's index in its pathway: a tie of two lines with the same ends
		pos         int       // the piece's place along the line, as numbered
	}
	keys := make([]key, len(b.pieces))
	along := make(map[int]int) // part → pieces met so far
	for i, pc := range b.pieces {
		p := &b.parts[pc.part]
		a, z := p.ll[0], p.ll[len(p.ll)-1]
		flip := endFirst(z, a)
		if a == z && len(p.ll) > 2 {
			flip = endFirst(p.ll[len(p.ll)-2], p.ll[1])
		}
		pos := along[pc.part]
		along[pc.part]++
		if flip {
			a, z, pos = z, a, -pos
		}
		keys[i] = key{a, z, p.k, pos}
	}
	order := make([]int, len(b.pieces))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(x, y int) bool {
		px, py := b.parts[b.pieces[order[x]].part].pw, b.parts[b.pieces[order[y]].part].pw
		kx, ky := keys[order[x]], keys[order[y]]
		switch {
		case px != py:
			return px < py
		case kx.first != ky.first:
			return lessLL(kx.first, ky.first)
		case kx.last != ky.last:
			return lessLL(kx.last, ky.last)
		case kx.k != ky.k:
			return kx.k < ky.k
		}
		return kx.pos < ky.pos
	})
	return order
}

func (b *builder) spans(n *Network) {
	for _, i := range b.pieceOrder() {
		pc := b.pieces[i]
		p := b.parts[pc.part]
		pw := b.c.Pathways[p.pw]
		id := b.spanID[i]
		pts, from, to := canonical(pc)
		bends, near := b.lineBends(pts)
		n.Spans = append(n.Spans, Span{
			ID: id, PathwayID: pw.ID, From: b.ids[from], To: b.ids[to],
			LengthM: LengthM(pts), Type: pw.Type, Status: pw.Status, EMI: pw.EMI,
			Surface: pw.Surface, Method: pw.Method, MethodSet: pw.MethodSet, Plenum: pw.Plenum, Group: pw.Group, SpareDucts: pw.SpareDucts, DuctMM: pw.DuctMM,
			BendsDeg: bends, Line: pts, near: near,
		})
	}
	sort.Slice(n.Spans, func(i, j int) bool { return n.Spans[i].ID < n.Spans[j].ID })
	for i := 1; i < len(n.Spans); i++ {
		if n.Spans[i].ID == n.Spans[i-1].ID {
			s := n.Spans[i]
			pw := b.pathway(s.PathwayID)
			b.add(pw.Source, pw.ID, PropID, problemf(ErrDuplicateID, "span id %q is used twice", s.ID))
		}
	}
}

// canonical is a piece's line and ends in the direction its geometry alone decides (endFirst
// on its two ends; a closed piece by its second and second-to-last points), so a span does
// not depend on which way its pathway was drawn: its From end, the lengths summed along it,
// the handholes placed from its From end and the problem's fingerprint stay the same when
// a line is reversed.
func canonical(pc piece) (pts orb.LineString, from, to int) {
	n := len(pc.pts)
	if n < 2 {
		return pc.pts, pc.from, pc.to
	}
	a, z := pc.pts[0], pc.pts[n-1]
	if a == z && n > 2 {
		a, z = pc.pts[1], pc.pts[n-2]
	}
	if !endFirst(z, a) {
		return pc.pts, pc.from, pc.to
	}
	pts = slices.Clone(pc.pts)
	slices.Reverse(pts)
	return pts, pc.to, pc.from
}

func (b *builder) pathway(id string) Pathway {
	for _, pw := range b.c.Pathways {
		if pw.ID == id {
			return pw
		}
	}
	return Pathway{}
}

func (b *builder) junctions(n *Network) {
	roots := make([]int, 0, len(b.ids))
	for r := range b.ids {
		roots = append(roots, r)
	}
	sort.Ints(roots)
	kind := make(map[int]Junction)
	for i, m := range b.mem {
		r := b.find(i)
		if _, ok := b.ids[r]; !ok {
			continue
		}
		switch m.kind {
		case memStructure:
			s := b.c.Structures[m.ref]
			kind[r] = Junction{Kind: JunctionStructure, StructureType: s.Type}
		case memEntrance:
			kind[r] = Junction{Kind: JunctionEntrance}
		}
	}
	for _, r := range roots {
		j, ok := kind[r]
		if !ok {
			j.Kind = JunctionNode
		}
		j.ID, j.Point = b.ids[r], b.rep[r]
		n.Junctions = append(n.Junctions, j)
	}
	sort.Slice(n.Junctions, func(i, j int) bool { return n.Junctions[i].ID < n.Junctions[j].ID })
	for i := 1; i < len(n.Junctions); i++ {
		if n.Junctions[i].ID == n.Junctions[i-1].ID {
			b.errs.Add(problemf(ErrDuplicateID, "geo: junction id %q is used twice", n.Junctions[i].ID))
		}
	}
}

func (b *builder) access(n *Network) {
	degree := make(map[string]int)
	for _, s := range n.Spans {
		degree[s.From]++
		degree[s.To]++
	}
	for bi, bl := range b.c.Buildings {
		pl := b.plans[bi]
		a := Access{Building: bl.ID, Via: pl.via}
		switch pl.via {
		case ViaFootprint:
			best := ""
			for _, m := range pl.cands {
				id, ok := b.ids[b.find(m)]
				if !ok {
					continue
				}
				if best == "" || degree[id] > degree[best] || (degree[id] == degree[best] && id < best) {
					best = id
				}
			}
			if best == "" {
				b.unjoin(bi, "the pathway ends on the footprint were dropped as shorter than 3×SnapM")
				continue
			}
			a.Junction = best
		case ViaEntrance, ViaLateral:
			r := b.find(pl.target)
			a.Junction = b.ids[r]
			a.LateralM, a.Lateral = b.lateralTo(bi, pl.via, r, pl.from, pl.lateral)
			if a.LateralM > b.maxLat {
				what := "footprint"
				if pl.via == ViaEntrance {
					what = "entrance"
				}
				b.unjoin(bi, "no pathway within %s m of the %s (design: max_lateral_m); nearest is %s m",
					fmtM(b.maxLat), what, fmtM(a.LateralM))
				continue
			}
		default:
			continue // already reported
		}
		n.Access = append(n.Access, a)
	}
	sort.Slice(n.Access, func(i, j int) bool { return n.Access[i].Building < n.Access[j].Building })
	n.Unjoined = slices.Clone(b.unjoined)
	slices.SortFunc(n.Unjoined, func(x, y Unjoined) int { return strings.Compare(x.Building, y.Building) })
}

// lateralTo is the counted lateral of building bi to the junction with root r: from the
// entrance point from when has (a declared entrance off the pathways), or for ViaLateral from
// the nearest point of the footprint's boundary unless the junction is inside it.
func (b *builder) lateralTo(bi int, via string, r int, from orb.Point, has bool) (float64, orb.LineString) {
	end := b.rep[r]
	if via == ViaLateral {
		f := &b.feet[bi]
		if xy := b.proj.xy(end); !f.contains(xy) {
			from, _ = f.nearestBoundary(xy)
			has = true
		}
	}
	if has {
		if d := DistanceM(from, end); d > 0 {
			return d, orb.LineString{from, end}
		}
	}
	return 0, nil
}

// crossings warns about pathways, and lines of one pathway, that cross with no junction where
// they cross.
func (b *builder) crossings() {
	type crossing struct {
		pa, pb int // parts, pa's pathway id < pb's
		along  float64
		at     orb.Point
	}
	var found []crossing
	tol := 2*b.snap + 1e-6
	var ids []int32
	for s, sr := range b.segs {
		p := &b.parts[sr.part]
		a, c := p.xy[sr.i], p.xy[sr.i+1]
		lo := vec{math.Min(a.x, c.x), math.Min(a.y, c.y)}
		hi := vec{math.Max(a.x, c.x), math.Max(a.y, c.y)}
		ids = b.segGrid.query(lo, hi, ids)
		for _, o := range ids {
			if int(o) <= s {
				continue
			}
			or := b.segs[o]
			q := &b.parts[or.part]
			if or.part == sr.part {
				continue // a line crossing itself
			}
			t, u, ok := segIntersect(a, c, q.xy[or.i], q.xy[or.i+1])
			if !ok {
				continue
			}
			alongP, alongQ := p.along(sr.i, t), q.along(or.i, u)
			if b.joinedNear(sr.part, alongP, or.part, alongQ, tol) {
				continue
			}
			cr := crossing{pa: sr.part, pb: or.part, along: alongP, at: lerpLL(p.ll[sr.i], p.ll[sr.i+1], t)}
			if qi, pi := b.c.Pathways[q.pw].ID, b.c.Pathways[p.pw].ID; qi < pi || (qi == pi && or.part < sr.part) {
				cr = crossing{pa: or.part, pb: sr.part, along: alongQ, at: lerpLL(q.ll[or.i], q.ll[or.i+1], u)}
			}
			found = append(found, cr)
		}
	}
	sort.Slice(found, func(i, j int) bool {
		x, y := found[i], found[j]
		if x.pa != y.pa {
			return x.pa < y.pa
		}
		if x.pb != y.pb {
			return x.pb < y.pb
		}
		return x.along < y.along
	})
	for i, cr := range found {
		if i > 0 {
			pr := found[i-1]
			if pr.pa == cr.pa && pr.pb == cr.pb && cr.along-pr.along <= tol {
				continue
			}
		}
		pa, pb := b.c.Pathways[b.parts[cr.pa].pw], b.c.Pathways[b.parts[cr.pb].pw]
		if b.cutOff(pa.ID, cr.at) || b.cutOff(pb.ID, cr.at) {
			continue // on a stretch inside a building that cutAtWalls left off
		}
		if pa.ID == pb.ID { // two lines of one MultiLineString
			b.warns = append(b.warns, warnRec{pa.Source, pa.ID, fmt.Sprintf(
				"lines %d and %d of pathway %q cross at %s, %s with no shared vertex or structure; they are not joined there",
				b.parts[cr.pa].k+1, b.parts[cr.pb].k+1, pa.ID, fmtLL(cr.at[0]), fmtLL(cr.at[1]))})
			continue
		}
		b.warns = append(b.warns, warnRec{pa.Source, pa.ID, fmt.Sprintf(
			"pathways %q and %q cross at %s, %s with no shared vertex or structure; they are not joined there",
			pa.ID, pb.ID, fmtLL(cr.at[0]), fmtLL(cr.at[1]))})
	}
}

// joinedNear reports whether parts p and q share a junction within tol (along each) of the
// given positions.
func (b *builder) joinedNear(p int, alongP float64, q int, alongQ float64, tol float64) bool {
	near := func(pi int, along float64) []int {
		es := b.entries[pi]
		k := sort.Search(len(es), func(i int) bool { return es[i].along >= along-tol })
		var roots []int
		for ; k < len(es) && es[k].along <= along+tol; k++ {
			roots = append(roots, b.find(es[k].m))
		}
		return roots
	}
	rq := near(q, alongQ)
	for _, r := range near(p, alongP) {
		for _, s := range rq {
			if r == s {
				return true
			}
		}
	}
	return false
}

func (b *builder) warnings() []Warning {
	// By what they say and the feature's id, not by where the feature stands in its file, so
	// that another feature order or file split lists the same warnings in the same order.
	sort.SliceStable(b.warns, func(i, j int) bool {
		x, y := b.warns[i], b.warns[j]
		if x.msg != y.msg {
			return x.msg < y.msg
		}
		if x.id != y.id {
			return x.id < y.id
		}
		return x.src.compare(y.src) < 0
	})
	slip := map[warnRec]bool{}
	for _, w := range b.c.slips {
		slip[w] = true
	}
	var out []Warning
	for _, w := range b.warns {
		out = append(out, Warning{File: w.src.File, Feature: w.src.Short(w.id), Message: w.msg, Slip: slip[w]})
	}
	return out
}

// fmtM prints a length in metres for a message.
func fmtM(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

// fmtLL prints a longitude or latitude to 7 decimals (about 1 cm).
func fmtLL(x float64) string { return strconv.FormatFloat(x, 'f', 7, 64) }
