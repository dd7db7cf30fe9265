package plan

import (
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/media/install"
)

// Redundancy values of a link.
const (
	RedundancyNone    = "none"
	RedundancyDiverse = "diverse"
)

// FutureRateNone is the future_rate that plans a link for its rate alone, the default; ""
// (the key absent or empty) says the same. A link's own future_rate: none overrides a
// future rate of the defaults.
const FutureRateNone = "none"

// FutureRate is the future rate the value v of a future_rate key asks for: "" for none
// (FutureRateNone or ""), v otherwise. The one place that reads "none".
func FutureRate(v string) string {
	if v == FutureRateNone {
		return ""
	}
	return v
}

// Objective values of design.objective.
const (
	ObjectiveCost   = "cost"
	ObjectiveLength = "length"
)

// Plan is a parsed plan file. Paths in it are resolved against the plan file's folder.
type Plan struct {
	File   string   `yaml:"-"` // the plan file's path, for messages
	Dir    string   `yaml:"-"` // the folder paths are relative to
	Name   string   `yaml:"name"`
	Campus FileList `yaml:"campus"`
	// CampusDatabase is the connection string (libpq key=value or postgresql:// URI) of a
	// PostgreSQL/PostGIS database whose tables hold the campus, read with the files of
	// Campus as one campus; "" for none. Not resolved against the plan's folder.
	CampusDatabase string     `yaml:"campus_database"`
	Hub            string     `yaml:"hub"`
	Budget         Money      `yaml:"budget"`
	Defaults       Defaults   `yaml:"defaults"`
	Links          []LinkSpec `yaml:"links"`
	Design         Design     `yaml:"design"`
	Catalog        string     `yaml:"catalog"` // optional media catalog file
	Rules          string     `yaml:"rules"`   // optional rule file
	Prices         string     `yaml:"prices"`  // optional price book file
	// Notes are lines of text the plan's outputs carry first among its notes (route.Result
	// .Notes: summary.json's notes, the terminal's note lines, the report's Notes): what
	// whoever wrote the plan wants said with it. A sweep writes there what it changed in a
	// scenario's plan beyond its overrides (a link entry carried to another hub), so that the
	// scenario's outputs say it, planned by the sweep or alone.
	Notes []string `yaml:"notes" scalar:"text"`

	// MaxInputBytes caps each file the plan reads (campus, catalog, rules, prices), in
	// bytes; 0 for the defaults (input.DefaultDataMiB MiB for GeoJSON, input.DefaultTextMiB
	// for YAML). It is not read from the file: the command line sets it.
	MaxInputBytes int64 `yaml:"-"`

	at map[string]input.Pos // position of each key and list element given, by key path ("design.slack_m", "links[2]")
}

// FileList is one file name or a list of them.
type FileList []string

// UnmarshalYAML reads a file name or a list of file names.
func (f *FileList) UnmarshalYAML(n *yaml.Node) error {
	bad := input.Errorf(input.ErrWrongType, "want a file name or a list of file names, got %s", input.KindName(n))
	switch n.Kind {
	case yaml.ScalarNode:
		if n.Tag != "!!str" {
			return bad
		}
		*f = FileList{n.Value}
		return nil
	case yaml.SequenceNode:
		var out FileList
		for _, it := range n.Content {
			it = input.Resolve(it)
			if it.Kind != yaml.ScalarNode || it.Tag != "!!str" {
				return bad
			}
			out = append(out, it.Value)
		}
		*f = out
		return nil
	}
	return bad
}

// Defaults apply to every link that does not say otherwise.
type Defaults struct {
	Rate       string  `yaml:"rate"`        // e.g. "10G"
	FutureRate string  `yaml:"future_rate"` // "" or FutureRateNone when none (FutureRate)
	Strands    int     `yaml:"strands"`     // strands required before growth
	Growth     float64 `yaml:"growth"`      // growth fraction, 0.5 = 50 %
	Redundancy string  `yaml:"redundancy"`  // RedundancyNone or RedundancyDiverse
}

// LinkSpec is one entry of the plan's links list. Empty fields take the defaults; From empty
// means the building's nearest cross-connect (the hub for an ic).
type LinkSpec struct {
	Line       int      `yaml:"-"` // line of the entry in the plan file
	From       string   `yaml:"from"`
	To         string   `yaml:"to"`
	Rate       string   `yaml:"rate"`
	FutureRate string   `yaml:"future_rate"`
	Strands    int      `yaml:"strands"`
	Growth     *float64 `yaml:"growth"`
	Redundancy string   `yaml:"redundancy"`
	Skip       bool     `yaml:"skip"`
}

// Design holds the plan's design switches; lengths are metres, losses dB.
type Design struct {
	LossMarginDB   float64 `yaml:"loss_margin_db"` // a floor on every fibre link's margin, multimode included; 0: the margin policy alone
	AllowNewTrench bool    `yaml:"allow_new_trench"`
	// TurnHandholes lets a route change from one pathway to another at a junction without a
	// structure, where the plan then digs a handhole (a cable changes duct bank only in a
	// structure); false: routes change pathway only at existing structures and in buildings.
	TurnHandholes      bool    `yaml:"turn_handholes"`
	AllowOutdoorCopper bool    `yaml:"allow_outdoor_copper"`
	MaxLateralM        float64 `yaml:"max_lateral_m"`
	SnapM              float64 `yaml:"snap_m"`
	SlackM             float64 `yaml:"slack_m"`        // slack per link end, in metres
	PairLossDB         float64 `yaml:"pair_loss_db"`   // design loss per mated connector pair; 0 = catalog (design_pair_db, 0.5 dB; TIA-568.3-D allows 0.75, and the margin keeps the difference)
	SpliceLossDB       float64 `yaml:"splice_loss_db"` // design loss per splice; 0 = catalog (TIA-568.3-D 0.3 dB)
	// Termination is how fibre strands are terminated: media.TerminationSplicedPigtail,
	// TerminationFieldConnector or TerminationFactory; "" = what the price book's termination
	// price buys (its termination_method). Spliced pigtails add a splice at each end.
	Termination  string  `yaml:"termination"`
	CopperCordsM float64 `yaml:"copper_cords_m"` // patch and equipment cords of a copper channel, both ends; 0 = 10 m
	Objective    string  `yaml:"objective"`

	// Installation: what the cable takeoff and the pulling plan assume.
	WastePct            float64 `yaml:"waste_pct"`              // cable bought beyond the measured length, in percent
	SlackLoopEntranceM  float64 `yaml:"slack_loop_entrance_m"`  // slack loop at each building entrance, in metres
	SlackLoopStructureM float64 `yaml:"slack_loop_structure_m"` // slack loop at each maintenance hole or handhole passed, in metres
	ReelM               float64 `yaml:"reel_m"`                 // longest cable on one reel, in metres; longer runs get mid-span splices
	// SpliceSlackM is the splicing slack per cable end at a mid-span join between reels, in
	// metres: the join is made above ground beside the structure (in a splicing vehicle or
	// tent), so each end reaches up to it and is coiled in the structure with the closure
	// afterwards. Each join puts 2 × SpliceSlackM more in the cable bought and in the channel.
	SpliceSlackM float64 `yaml:"splice_slack_m"`
	// PoleRiserM is the cable, in metres, that a counted lateral leaving a pole line takes on
	// the pole: from the strand down the pole's riser into the handhole at its foot
	// (geo.Entry.PoleRiser; items.PoleRiserM). It is in the leg's risers, so in the cable
	// bought, the channel and the loss budget.
	PoleRiserM       float64 `yaml:"pole_riser_m"`
	PullMu           float64 `yaml:"pull_mu"`               // coefficient of friction between cable and duct
	PullBendDeg      float64 `yaml:"pull_bend_deg"`         // most bend degrees between pull points
	PullMaxM         float64 `yaml:"pull_max_m"`            // most metres between pull points; 0 for no limit
	PullMaxSWBPNPerM float64 `yaml:"pull_max_swbp_n_per_m"` // most sidewall bearing pressure at a bend, N/m; 0: not checked

	// New construction: how a proposed pathway is built when the plan opens it.
	NewDucts         int     `yaml:"new_ducts"`          // ducts laid in each new trench or bore of a duct pathway, at least (items.NewDucts)
	HandholeSpacingM float64 `yaml:"handhole_spacing_m"` // most metres between pull points along new construction; 0 for no limit
	// AssumedSurface is the surface new work is priced on where the campus gives none: a
	// pathway without "surface" (every trench beside an existing duct whose pathway has none)
	// and a counted lateral. Every span and lateral billed on it is named in a warning.
	AssumedSurface string `yaml:"assumed_surface"`

	// Innerduct: when InnerductODMM > 0, every cable laid in a duct goes into an innerduct of
	// its own, of this outside and inside diameter in millimetres. Duct fill then counts the
	// innerducts, a cable must fit its innerduct, and the bill adds the innerduct and placing it.
	InnerductODMM float64 `yaml:"innerduct_od_mm"`
	InnerductIDMM float64 `yaml:"innerduct_id_mm"`
	// CablesPerDuct is the most loose cables one duct is given, each pulled on its own, before
	// the next goes into another duct (install.PullLimit: a sound set of pulls, common
	// practice, no published source; install.DefaultCablesPerDuct); 0 is no count, the NFPA 70
	// Chapter 9 Table 1 fill and the jam band alone. It is the one value every packing of
	// cables into ducts is given: the optimizer's (optimize.Edge.CablesPerDuct, set by
	// routing), the bill's fill check and spread (install.DuctBank), the warm start's room
	// check. Innerducts (InnerductODMM > 0) are not counted.
	CablesPerDuct int `yaml:"cables_per_duct"`
}

// Innerduct reports whether the design places innerduct in ducts.
func (d Design) Innerduct() bool { return d.InnerductODMM > 0 }

// Money is an amount in integer cents, read from a YAML number such as 1250000 or 1250000.50.
type Money int64

// UnmarshalYAML reads a decimal amount without going through a float.
func (m *Money) UnmarshalYAML(n *yaml.Node) error {
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		return input.Errorf(input.ErrWrongType, "want an amount such as 1250000 or 99.95, got %s", input.KindName(n))
	}
	c, err := ParseCents(n.Value)
	if err != nil {
		return input.Errorf(input.ErrBadValue, "%v", err)
	}
	*m = Money(c)
	return nil
}

// ParseCents reads a non-negative decimal amount with at most two decimals into cents.
func ParseCents(s string) (int64, error) {
	s = strings.TrimSpace(strings.ReplaceAll(s, "_", ""))
	whole, frac, hasFrac := strings.Cut(s, ".")
	if whole == "" || (hasFrac && (len(frac) == 0 || len(frac) > 2)) {
		return 0, fmt.Errorf("want an amount such as 1250000 or 99.95, got %q", s)
	}
	for len(frac) < 2 {
		frac += "0"
	}
	var c int64
	for _, r := range whole + frac {
		if r < '0' || r > '9' {
			return 0, fmt.Errorf("want an amount such as 1250000 or 99.95, got %q", s)
		}
		c = c*10 + int64(r-'0')
		if c > 1e17 {
			return 0, fmt.Errorf("amount %q is too large", s)
		}
	}
	return c, nil
}

// MinHandholeSpacingM is the closest design.handhole_spacing_m may place handholes along new
// construction, in metres: closer is a slip of unit, not a design (common practice, no
// published source).
const MinHandholeSpacingM = 10

// Default are the values a plan gets for what it leaves out.
var Default = Plan{
	Defaults: Defaults{Rate: "10G", Strands: 12, Growth: 0.5, Redundancy: RedundancyNone},
	Design: Design{
		// No margin of the plan's own: the margin policy (media's marginParts: what the
		// channel's pairs and splices may lose at their TIA-568.3-D maxima beyond the design
		// losses, and media/catalog.yaml's margins) says what each link keeps.
		LossMarginDB:   0,
		AllowNewTrench: true,
		TurnHandholes:  true,
		MaxLateralM:    30,
		SnapM:          0.5,
		SlackM:         5,
		Objective:      ObjectiveCost,
		// Common practice, no published source: 5 % waste, 3 m loops at entrances and at
		// maintenance holes and handholes, 4 km reels of outside-plant fibre.
		WastePct:            5,
		SlackLoopEntranceM:  3,
		SlackLoopStructureM: 3,
		ReelM:               4000,
		// Common practice, no published source: 10–15 m of splicing slack a cable end at a
		// mid-span join (from memory); the upper end, so that a leg near its loss budget or its
		// reel is not called feasible on slack the crew will leave.
		SpliceSlackM: 15,
		// Common practice, no published source: a communication cable is attached some 5 to
		// 6 m up a campus pole (from memory), and its riser ends about half a metre into the
		// handhole at the foot; 6 m, the upper end, so that a reel is not cut short.
		PoleRiserM: 6,
		// μ 0.5 is the usual default when the duct and lubricant are unknown (cable pulling
		// statics, see REFERENCES); TIA-569 allows at most 180° of bends between pull points.
		// TIA-569's 30 m between pull points applies to conduit in buildings, so campus duct
		// gets no length limit unless the plan sets one.
		PullMu:      0.5,
		PullBendDeg: 180,
		// Common practice, no published source: a new duct bank carries a spare beside the duct
		// the plan needs (designers rarely trench for one conduit), and outside-plant duct gets a
		// handhole about every 150 m; the bend budget between them is pull_bend_deg.
		NewDucts:         2,
		HandholeSpacingM: 150,
		// Common practice, no published source: three loose cables a duct, each pulled on its
		// own (install.DefaultCablesPerDuct).
		CablesPerDuct: install.DefaultCablesPerDuct,
		// Common practice, no published source: most campus trench runs under lawns, and the
		// cheapest surface is the one an estimator must be told was assumed (a warning names
		// every span billed on it).
		AssumedSurface: geo.SurfaceTurf,
	},
}

// ErrPlan matches, through errors.Is, every problem of a plan file: each is an
// *input.Problem whose Class is ErrPlan.
var ErrPlan = errors.New("invalid plan")

// Problem returns a problem of the plan file at key, a key path ("design.slack_m",
// "links[2].to"): at the key's line and column, or for a key the file leaves out at its
// section's, or nowhere when the file has neither.
func (p *Plan) Problem(key string, err error) *input.Problem {
	pos, path := input.Pos{}, key
	for path != "" {
		if at, ok := p.at[path]; ok {
			pos = at
			break
		}
		i := strings.LastIndexAny(path, ".[")
		if i < 0 {
			break
		}
		path = path[:i]
	}
	return input.Place(input.Problem{File: p.File, Line: pos.Line, Col: pos.Col, Key: key, Class: ErrPlan}, err)
}

// LoadPlan reads and validates a plan file, a regular file of at most input.DefaultTextMiB
// MiB.
func LoadPlan(path string) (*Plan, error) { return LoadPlanLimit(path, 0) }

// LoadPlanLimit is LoadPlan with a cap of maxBytes bytes on the plan file, kept in
// Plan.MaxInputBytes for the files the plan names (0: the defaults).
func LoadPlanLimit(path string, maxBytes int64) (*Plan, error) {
	return LoadPlanOptions(path, LoadOptions{MaxInputBytes: maxBytes})
}

// LoadOptions are what the command line adds to a plan file.
type LoadOptions struct {
	// MaxInputBytes caps the plan file and is kept in Plan.MaxInputBytes (0: the defaults).
	MaxInputBytes int64
	// CampusDatabase, when not "", replaces the plan's campus_database before the plan is
	// checked, so a plan that names no campus of its own is complete with it.
	CampusDatabase string
}

// LoadPlanOptions is LoadPlan with the command line's options.
func LoadPlanOptions(path string, o LoadOptions) (*Plan, error) {
	p, err := LoadPlanPartial(path, o)
	if err != nil {
		return nil, err
	}
	return p, nil
}

// LoadPlanPartial is LoadPlanOptions that, when the file is a plan with problems in its values
// (an unknown key, a number out of range, a bad choice), returns besides the problems the plan
// as read, each bad value left at its default: enough to read the campus it names and look
// for the problems only the campus shows (an unknown building, a hub that is not one), so
// that a user sees them all at once. The plan is nil when the file could not be read or is
// not a plan (not YAML, not a mapping, a sweep file); it must never be planned.
func LoadPlanPartial(path string, o LoadOptions) (*Plan, error) {
	data, err := input.ReadFile(path, input.Cap(o.MaxInputBytes, input.DefaultTextMiB))
	if err != nil {
		return nil, &input.Problem{File: path, Err: fmt.Errorf("read: %w", input.Cause(err)), Class: ErrPlan}
	}
	p, err := parsePlan(path, data, o)
	if p != nil {
		p.MaxInputBytes = o.MaxInputBytes
	}
	return p, err
}

// ParsePlan reads a plan from data; name is the plan file's path, used for messages and to
// resolve the relative paths in it. Every problem of the file comes back at once, as an
// *input.Problems in line order.
func ParsePlan(name string, data []byte) (*Plan, error) {
	return ParsePlanOptions(name, data, LoadOptions{})
}

// ParsePlanOptions is ParsePlan with the command line's campus database (o.CampusDatabase;
// o.MaxInputBytes is not used).
func ParsePlanOptions(name string, data []byte, o LoadOptions) (*Plan, error) {
	p, err := parsePlan(name, data, o)
	if err != nil {
		return nil, err
	}
	return p, nil
}

// parsePlan is ParsePlanOptions that returns the plan as read beside the problems of its
// values (LoadPlanPartial); nil when the file is not a plan.
func parsePlan(name string, data []byte, o LoadOptions) (*Plan, error) {
	p := Default
	p.File = name
	p.Dir = filepath.Dir(name)
	p.at = map[string]input.Pos{}
	var errs input.Problems
	d := &input.Decoder{File: name, Problems: &errs, Class: ErrPlan, Where: p.at, RangeOf: SettingRange}
	root := d.Parse(data, &p)
	isPlan := root != nil && input.Resolve(root).Kind == yaml.MappingNode
	if isPlan {
		if isSweepFile(p.at) {
			// Its keys are all unknown to a plan: say what the file is instead.
			errs = input.Problems{}
			errs.Add(p.Problem("base", input.Errorf(input.ErrUnknownKey,
				"this is a sweep file (it has base: and vary: or cases:), not a plan; run `spanwright sweep %s --out DIR`", name)))
			return nil, errs.Err()
		}
		for i := range p.Links {
			p.Links[i].Line = p.at[fmt.Sprintf("links[%d]", i)].Line
		}
		if o.CampusDatabase != "" {
			p.CampusDatabase = o.CampusDatabase
		}
		p.validate(&errs)
	}
	errs.Sort()
	if err := errs.Err(); err != nil {
		if !isPlan {
			return nil, err
		}
		return &p, err
	}
	return &p, nil
}

// isSweepFile reports whether a file read as a plan has the top-level keys of a sweep file
// (route/sweep): base, and vary or cases; no plan has them.
func isSweepFile(at map[string]input.Pos) bool {
	_, base := at["base"]
	_, vary := at["vary"]
	_, cases := at["cases"]
	return base && (vary || cases)
}

// validate adds to errs the problems the walker cannot see: values outside a list of
// choices, keys that must go together. Numbers are in range: the walker checked them
// (SettingRange) and left the default where one was not.
func (p *Plan) validate(errs *input.Problems) {
	bad := func(key string, kind error, format string, args ...any) {
		errs.Add(p.Problem(key, input.Errorf(kind, format, args...)))
	}
	reported := func(keys ...string) bool {
		for _, e := range errs.List {
			if slices.Contains(keys, e.Key) {
				return true
			}
		}
		return false
	}
	if len(p.Campus) == 0 && p.CampusDatabase == "" && !reported("campus", "campus_database") {
		if _, given := p.at["campus"]; given {
			bad("campus", input.ErrBadValue, "want at least one campus file (GeoJSON, or GeoPackage .gpkg), got none")
		} else {
			bad("campus", input.ErrMissingKey, "missing; name at least one campus file (GeoJSON, or GeoPackage .gpkg), or a campus_database")
		}
	}
	for i, n := range p.Notes {
		// A note the walker refused (not text) is left empty: that problem says it, once.
		if key := fmt.Sprintf("notes[%d]", i); strings.TrimSpace(n) == "" && !reported(key) {
			bad(key, input.ErrBadValue, "want a line of text, got an empty one")
		}
	}
	d := p.Defaults
	if d.Redundancy != RedundancyNone && d.Redundancy != RedundancyDiverse {
		bad("defaults.redundancy", input.ErrBadValue, "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, d.Redundancy)
	}
	for i, l := range p.Links {
		key := fmt.Sprintf("links[%d].", i)
		if l.To == "" && !reported(key+"to") {
			bad(key+"to", input.ErrMissingKey, "missing; a link names the building it serves")
		}
		if l.Redundancy != "" && l.Redundancy != RedundancyNone && l.Redundancy != RedundancyDiverse {
			bad(key+"redundancy", input.ErrBadValue, "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, l.Redundancy)
		}
	}
	g := p.Design
	if t := g.Termination; t != "" && t != media.TerminationSplicedPigtail && t != media.TerminationFieldConnector && t != media.TerminationFactory {
		bad("design.termination", input.ErrBadValue, "want %q, %q or %q, got %q", media.TerminationSplicedPigtail, media.TerminationFieldConnector, media.TerminationFactory, t)
	}
	if g.Objective != ObjectiveCost && g.Objective != ObjectiveLength {
		bad("design.objective", input.ErrBadValue, "want %q or %q, got %q", ObjectiveCost, ObjectiveLength, g.Objective)
	}
	if !reported("design.assumed_surface") && !slices.Contains(geo.Surfaces(), g.AssumedSurface) {
		bad("design.assumed_surface", input.ErrBadValue, "want one of %s, got %q", strings.Join(geo.Surfaces(), ", "), g.AssumedSurface)
	}
	if !reported("design.handhole_spacing_m") && g.HandholeSpacingM > 0 && g.HandholeSpacingM < MinHandholeSpacingM {
		bad("design.handhole_spacing_m", input.ErrBadValue, "want 0 (no limit) or at least %g metres, got %g", float64(MinHandholeSpacingM), g.HandholeSpacingM)
	}
	// A reel between two joins carries the splicing slack at both its ends, and at least
	// MinReelRouteM of route besides.
	if carriesM := g.ReelM / (1 + g.WastePct/100); !reported("design.splice_slack_m", "design.reel_m", "design.waste_pct") && carriesM-2*g.SpliceSlackM < MinReelRouteM {
		bad("design.splice_slack_m", input.ErrBadValue, "want at most %.2f metres: a reel carries reel_m / (1 + waste_pct/100) = %.2f m of channel, the splicing slack at both its joined ends (2 × splice_slack_m) and at least %g m of route besides; got %g",
			math.Floor((carriesM-MinReelRouteM)/2*100)/100, carriesM, float64(MinReelRouteM), g.SpliceSlackM)
	}
	switch {
	case reported("design.innerduct_od_mm", "design.innerduct_id_mm"):
	case g.InnerductODMM == 0 && g.InnerductIDMM != 0:
		bad("design.innerduct_id_mm", input.ErrBadValue, "want it only with design.innerduct_od_mm, got %g without", g.InnerductIDMM)
	case g.InnerductODMM > 0 && !(g.InnerductIDMM > 0 && g.InnerductIDMM < g.InnerductODMM):
		bad("design.innerduct_id_mm", input.ErrBadValue, "want millimetres above 0 and below innerduct_od_mm (%g), got %g", g.InnerductODMM, g.InnerductIDMM)
	}
}

// MinReelRouteM is the least route, in metres, a reel between two joins must carry besides the
// splicing slack at its two ends (2 × splice_slack_m, design.splice_slack_m's limit): cable is
// bought and cut from reels in whole metres (routing's reels and reel cuts round each up), so a
// reel carrying less than a metre of route adds a join, its splices and its slack for less
// cable than the takeoff measures. Without it the splicing slack could come within a hair of
// half a reel, a join for every few centimetres of route: review 15 F5 (reel_m 100, 5 % waste,
// splice_slack_m 47.6: 4 cm a reel, 25,000 joins a kilometre; at 47.6190476, 50 nm a reel, the
// takeoff placed billions of joins and never finished). Common practice, no published source.
const MinReelRouteM = 1

// MaxStrands is the most strands a link may ask for: the largest cables hold a few thousand
// fibres.
const MaxStrands = 10000

var (
	growthRange      = input.Range{Min: 0, Max: 10, Unit: "a fraction"}
	linkStrandsRange = input.Range{Min: 0, Max: MaxStrands, Whole: true, Unit: "strands"}
)

// planNumber is a numeric key of the plan's defaults or design sections and its range.
type planNumber struct {
	key string
	r   input.Range
}

// planNumbers are the ranges of the numeric keys of the defaults and design sections, in
// file order; a sweep file's values for them are checked against the same ranges
// (SettingRange). The ends are generous: they catch NaN, infinities, overflowing integers and
// slips of unit, not unusual designs.
var planNumbers = []planNumber{
	{key: "defaults.strands", r: input.Range{Min: 1, Max: MaxStrands, Whole: true, Unit: "strands"}},
	{key: "defaults.growth", r: growthRange},
	{key: "design.loss_margin_db", r: input.Range{Min: 0, Max: 50, Unit: "dB"}},
	{key: "design.max_lateral_m", r: input.Range{Min: 0, AboveMin: true, Max: 1000, Unit: "metres"}},
	{key: "design.snap_m", r: input.Range{Min: 0, AboveMin: true, Max: 100, Unit: "metres"}},
	{key: "design.slack_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}},
	{key: "design.pair_loss_db", r: input.Range{Min: 0, Max: 10, Unit: "dB"}},
	{key: "design.splice_loss_db", r: input.Range{Min: 0, Max: 10, Unit: "dB"}},
	// ANSI/TIA-568.2 allows 10 m of cords in a 100 m channel; more is a longer channel.
	{key: "design.copper_cords_m", r: input.Range{Min: 0, Max: 100, Unit: "metres"}},
	{key: "design.waste_pct", r: input.Range{Min: 0, Max: 100, Unit: "a percentage"}},
	{key: "design.slack_loop_entrance_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}},
	{key: "design.slack_loop_structure_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}},
	// A copper channel cannot be spliced, so a reel holds one at least.
	{key: "design.reel_m", r: input.Range{Min: MaxCopperChannelM, Max: 100000, Unit: "metres"}},
	{key: "design.splice_slack_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}},
	{key: "design.pole_riser_m", r: input.Range{Min: 0, Max: 100, Unit: "metres"}},
	{key: "design.pull_mu", r: input.Range{Min: 0, Max: 2, Unit: "a coefficient of friction"}},
	// NFPA 70 allows 360° of bends per raceway run.
	{key: "design.pull_bend_deg", r: input.Range{Min: 0, AboveMin: true, Max: 360, Unit: "degrees"}},
	{key: "design.pull_max_m", r: input.Range{Min: 0, Max: 100000, Unit: "metres"}},
	{key: "design.pull_max_swbp_n_per_m", r: input.Range{Min: 0, Max: 100000, Unit: "N/m"}},
	{key: "design.new_ducts", r: input.Range{Min: 1, Max: 64, Whole: true, Unit: "ducts"}},
	{key: "design.handhole_spacing_m", r: input.Range{Min: 0, Max: 100000, Unit: "metres"}},
	{key: "design.innerduct_od_mm", r: input.Range{Min: 0, Max: 1000, Unit: "millimetres"}},
	{key: "design.innerduct_id_mm", r: input.Range{Min: 0, Max: 1000, Unit: "millimetres"}},
	{key: "design.cables_per_duct", r: input.Range{Min: 0, Max: 1000, Whole: true, Unit: "loose cables a duct"}},
}

// SettingRange returns the range of a numeric plan setting by dotted key
// ("design.slack_m", "links.growth" for every link's), and false for a key that is not
// numeric.
func SettingRange(key string) (input.Range, bool) {
	switch key {
	case "links.strands":
		return linkStrandsRange, true
	case "links.growth":
		return growthRange, true
	}
	for _, k := range planNumbers {
		if k.key == key {
			return k.r, true
		}
	}
	return input.Range{}, false
}

// Path resolves a path named in the plan against the plan file's folder.
func (p *Plan) Path(name string) string {
	if name == "" || filepath.IsAbs(name) {
		return name
	}
	return filepath.Join(p.Dir, name)
}

// problems is errs as one *input.Problems, in file and line order.
func problems(errs []error) error {
	var l input.Problems
	for _, e := range errs {
		l.Add(e)
	}
	l.Sort()
	return l.Err()
}
