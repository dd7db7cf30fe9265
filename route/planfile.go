package route

import (
	"errors"
	"fmt"
	"path/filepath"
	"reflect"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// Redundancy values of a link.
const (
	RedundancyNone    = "none"
	RedundancyDiverse = "diverse"
)

// Objective values of design.objective.
const (
	ObjectiveCost   = "cost"
	ObjectiveLength = "length"
)

// Plan is a parsed plan file. Paths in it are resolved against the plan file's folder.
type Plan struct {
	File     string   `yaml:"-"` // the plan file's path, for messages
	Dir      string   `yaml:"-"` // the folder paths are relative to
	Name     string   `yaml:"name"`
	Campus   []string `yaml:"campus"`
	Hub      string   `yaml:"hub"`
	Budget   Money    `yaml:"budget"`
	Defaults Defaults `yaml:"defaults"`
	Links    []LinkSpec
	Design   Design `yaml:"design"`
	Catalog  string `yaml:"catalog"` // optional media catalog file
	Rules    string `yaml:"rules"`   // optional rule file
	Prices   string `yaml:"prices"`  // optional price book file

	// MaxInputBytes caps each file the plan reads (campus, catalog, rules, prices), in
	// bytes; 0 for the defaults (input.DefaultDataMiB MiB for GeoJSON, input.DefaultTextMiB
	// for YAML). It is not read from the file: the command line sets it.
	MaxInputBytes int64 `yaml:"-"`

	lines map[string]int // line of each key given in a section or a link, by key path ("design.slack_m", "links[2].growth")
}

// Defaults apply to every link that does not say otherwise.
type Defaults struct {
	Rate       string  `yaml:"rate"`        // e.g. "10G"
	FutureRate string  `yaml:"future_rate"` // "" when none
	Strands    int     `yaml:"strands"`     // strands required before growth
	Growth     float64 `yaml:"growth"`      // growth fraction, 0.5 = 50 %
	Redundancy string  `yaml:"redundancy"`  // RedundancyNone or RedundancyDiverse
}

// LinkSpec is one entry of the plan's links list. Empty fields take the defaults; From empty
// means the building's nearest cross-connect (the hub for an ic).
type LinkSpec struct {
	Line       int      `yaml:"-"` // line in the plan file, for messages
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
	LossMarginDB       float64 `yaml:"loss_margin_db"`
	AllowNewTrench     bool    `yaml:"allow_new_trench"`
	AllowOutdoorCopper bool    `yaml:"allow_outdoor_copper"`
	MaxLateralM        float64 `yaml:"max_lateral_m"`
	SnapM              float64 `yaml:"snap_m"`
	SlackM             float64 `yaml:"slack_m"`        // slack per link end, in metres
	PairLossDB         float64 `yaml:"pair_loss_db"`   // design loss per mated connector pair; 0 = catalog (TIA-568.3-D 0.75 dB)
	SpliceLossDB       float64 `yaml:"splice_loss_db"` // design loss per splice; 0 = catalog (TIA-568.3-D 0.3 dB)
	Objective          string  `yaml:"objective"`

	// Installation: what the cable takeoff and the pulling plan assume.
	WastePct            float64 `yaml:"waste_pct"`              // cable bought beyond the measured length, in percent
	SlackLoopEntranceM  float64 `yaml:"slack_loop_entrance_m"`  // slack loop at each building entrance, in metres
	SlackLoopStructureM float64 `yaml:"slack_loop_structure_m"` // slack loop at each maintenance hole or handhole passed, in metres
	ReelM               float64 `yaml:"reel_m"`                 // longest cable on one reel, in metres; longer runs get mid-span splices
	PullMu              float64 `yaml:"pull_mu"`                // coefficient of friction between cable and duct
	PullBendDeg         float64 `yaml:"pull_bend_deg"`          // most bend degrees between pull points
	PullMaxM            float64 `yaml:"pull_max_m"`             // most metres between pull points; 0 for no limit
	PullMaxSWBPNPerM    float64 `yaml:"pull_max_swbp_n_per_m"`  // most sidewall bearing pressure at a bend, N/m; 0: not checked

	// Innerduct: when InnerductODMM > 0, every cable laid in a duct goes into an innerduct of
	// its own, of this outside and inside diameter in millimetres. Duct fill then counts the
	// innerducts, a cable must fit its innerduct, and the bill adds the innerduct and placing it.
	InnerductODMM float64 `yaml:"innerduct_od_mm"`
	InnerductIDMM float64 `yaml:"innerduct_id_mm"`
}

// Innerduct reports whether the design places innerduct in ducts.
func (d Design) Innerduct() bool { return d.InnerductODMM > 0 }

// Money is an amount in integer cents, read from a YAML number such as 1250000 or 1250000.50.
type Money int64

// UnmarshalYAML reads a decimal amount without going through a float.
func (m *Money) UnmarshalYAML(n *yaml.Node) error {
	c, err := ParseCents(n.Value)
	if err != nil {
		return err
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

// PlanDefaults are the values a plan gets for what it leaves out.
var PlanDefaults = Plan{
	Defaults: Defaults{Rate: "10G", Strands: 12, Growth: 0.5, Redundancy: RedundancyNone},
	Design: Design{
		LossMarginDB:   1.0,
		AllowNewTrench: true,
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
		// μ 0.5 is the usual default when the duct and lubricant are unknown (cable pulling
		// statics, see REFERENCES); TIA-569 allows at most 180° of bends between pull points.
		// TIA-569's 30 m between pull points applies to conduit in buildings, so campus duct
		// gets no length limit unless the plan sets one.
		PullMu:      0.5,
		PullBendDeg: 180,
	},
}

// PlanError is one problem in a plan file: the file, the line (1-based, 0 when unknown),
// the key and what is wrong.
type PlanError struct {
	File string
	Line int
	Key  string
	Err  error
}

func (e *PlanError) Error() string {
	loc := e.File
	if e.Line > 0 {
		loc = fmt.Sprintf("%s:%d", e.File, e.Line)
	}
	if e.Key != "" {
		return fmt.Sprintf("%s: %s: %v", loc, e.Key, e.Err)
	}
	return fmt.Sprintf("%s: %v", loc, e.Err)
}

func (e *PlanError) Unwrap() error { return e.Err }

// ErrPlan marks a plan file problem.
var ErrPlan = errors.New("invalid plan")

// LoadPlan reads and validates a plan file, a regular file of at most input.DefaultTextMiB
// MiB.
func LoadPlan(path string) (*Plan, error) { return LoadPlanLimit(path, 0) }

// LoadPlanLimit is LoadPlan with a cap of maxBytes bytes on the plan file, kept in
// Plan.MaxInputBytes for the files the plan names (0: the defaults).
func LoadPlanLimit(path string, maxBytes int64) (*Plan, error) {
	data, err := input.ReadFile(path, input.Cap(maxBytes, input.DefaultTextMiB))
	if err != nil {
		return nil, &PlanError{File: path, Err: fmt.Errorf("%w: read: %w", ErrPlan, input.Cause(err))}
	}
	p, err := ParsePlan(path, data)
	if err != nil {
		return nil, err
	}
	p.MaxInputBytes = maxBytes
	return p, nil
}

// ParsePlan reads a plan from data; name is the plan file's path, used for messages and to
// resolve the relative paths in it.
func ParsePlan(name string, data []byte) (*Plan, error) {
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, &PlanError{File: name, Err: fmt.Errorf("%w: not YAML: %v", ErrPlan, err)}
	}
	if len(root.Content) == 0 || root.Content[0].Kind != yaml.MappingNode {
		return nil, &PlanError{File: name, Err: fmt.Errorf("%w: want a mapping of plan keys", ErrPlan)}
	}
	p := PlanDefaults
	p.File = name
	p.Dir = filepath.Dir(name)
	var errs []error
	for _, d := range input.YAMLDuplicates(&root) {
		errs = append(errs, &PlanError{File: name, Line: d.Line, Key: d.Where(), Err: fmt.Errorf("%w: %w", ErrPlan, d.Err())})
	}
	input.DropYAMLDuplicates(&root) // reported: check the rest as if each key were given once
	if err := decodeStrict(root.Content[0], &p, name); err != nil {
		errs = append(errs, err...)
	}
	p.lines = numberLines(root.Content[0])
	errs = append(errs, p.validate()...)
	if len(errs) > 0 {
		return nil, &ErrorList{Errs: errs}
	}
	return &p, nil
}

// decodeStrict decodes a plan mapping, reporting unknown keys with their lines.
func decodeStrict(n *yaml.Node, p *Plan, file string) []error {
	var errs []error
	known := map[string]bool{"name": true, "campus": true, "hub": true, "budget": true,
		"defaults": true, "links": true, "design": true, "catalog": true, "rules": true, "prices": true}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if !known[k.Value] {
			errs = append(errs, &PlanError{File: file, Line: k.Line, Key: k.Value,
				Err: fmt.Errorf("%w: unknown key; want one of %s", ErrPlan, keyList(known))})
			continue
		}
		var err error
		switch k.Value {
		case "links":
			err = decodeLinks(v, p)
		case "campus":
			if v.Kind == yaml.ScalarNode {
				p.Campus = []string{v.Value}
			} else {
				err = v.Decode(&p.Campus)
			}
		default:
			err = decodeKnown(v, fieldOf(p, k.Value))
		}
		if err != nil {
			errs = append(errs, &PlanError{File: file, Line: v.Line, Key: k.Value, Err: fmt.Errorf("%w: %v", ErrPlan, cleanYAMLErr(err))})
		}
	}
	return errs
}

func fieldOf(p *Plan, key string) any {
	switch key {
	case "name":
		return &p.Name
	case "hub":
		return &p.Hub
	case "budget":
		return &p.Budget
	case "defaults":
		return &p.Defaults
	case "design":
		return &p.Design
	case "catalog":
		return &p.Catalog
	case "rules":
		return &p.Rules
	case "prices":
		return &p.Prices
	}
	panic("route: no plan field for key " + key)
}

func decodeLinks(n *yaml.Node, p *Plan) error {
	if n.Kind != yaml.SequenceNode {
		return fmt.Errorf("want a list of links")
	}
	p.Links = nil
	for _, item := range n.Content {
		var ls LinkSpec
		if err := decodeKnown(item, &ls); err != nil {
			return fmt.Errorf("link at line %d: %v", item.Line, cleanYAMLErr(err))
		}
		ls.Line = item.Line
		p.Links = append(p.Links, ls)
	}
	return nil
}

// decodeKnown decodes n into out, a pointer, as a yaml.Decoder with KnownFields does: a key
// of a mapping that names no field of the struct it fills is an error. The errors come as
// one *yaml.TypeError in line order, each with its line in the plan file.
func decodeKnown(n *yaml.Node, out any) error {
	var msgs []string
	if t := reflect.TypeOf(out).Elem(); t.Kind() == reflect.Struct && n.Kind == yaml.MappingNode {
		fields := map[string]bool{}
		for i := 0; i < t.NumField(); i++ {
			name, _, _ := strings.Cut(t.Field(i).Tag.Get("yaml"), ",")
			if name == "" {
				name = strings.ToLower(t.Field(i).Name)
			}
			if name != "-" {
				fields[name] = true
			}
		}
		for i := 0; i+1 < len(n.Content); i += 2 {
			k := n.Content[i]
			if !fields[k.Value] && k.Tag != "!!merge" {
				msgs = append(msgs, fmt.Sprintf("line %d: field %s not found in type %s", k.Line, k.Value, t))
			}
		}
	}
	err := n.Decode(out)
	if len(msgs) == 0 {
		return err
	}
	var te *yaml.TypeError
	if err != nil {
		if !errors.As(err, &te) {
			return err
		}
		msgs = append(msgs, te.Errors...)
	}
	sort.SliceStable(msgs, func(i, j int) bool { return msgLine(msgs[i]) < msgLine(msgs[j]) })
	return &yaml.TypeError{Errors: msgs}
}

// msgLine is the line number a YAML decoding message starts with, or 0.
func msgLine(m string) int {
	rest, ok := strings.CutPrefix(m, "line ")
	if !ok {
		return 0
	}
	num, _, _ := strings.Cut(rest, ":")
	n, _ := strconv.Atoi(num)
	return n
}

func cleanYAMLErr(err error) string {
	s := err.Error()
	s = strings.TrimPrefix(s, "yaml: unmarshal errors:\n")
	s = strings.ReplaceAll(s, "\n  ", "; ")
	return strings.TrimSpace(s)
}

func keyList(m map[string]bool) string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return strings.Join(keys, ", ")
}

func (p *Plan) validate() []error {
	var errs []error
	bad := func(line int, key, format string, args ...any) {
		errs = append(errs, &PlanError{File: p.File, Line: line, Key: key, Err: fmt.Errorf("%w: "+format, append([]any{ErrPlan}, args...)...)})
	}
	if len(p.Campus) == 0 {
		bad(0, "campus", "want at least one campus GeoJSON file")
	}
	for _, k := range planNumbers {
		var err error
		if k.getInt != nil {
			err = k.r.CheckInt(int64(k.getInt(p)))
		} else {
			err = k.r.Check(k.get(p))
		}
		if err != nil {
			bad(p.lines[k.key], k.key, "%w", err)
		}
	}
	d := p.Defaults
	if d.Redundancy != RedundancyNone && d.Redundancy != RedundancyDiverse {
		bad(p.lines["defaults.redundancy"], "defaults.redundancy", "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, d.Redundancy)
	}
	for i, l := range p.Links {
		if l.To == "" {
			bad(l.Line, "links", "a link needs to: (the building served)")
		}
		if l.Redundancy != "" && l.Redundancy != RedundancyNone && l.Redundancy != RedundancyDiverse {
			bad(l.Line, "links.redundancy", "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, l.Redundancy)
		}
		at := func(key string) int {
			if line, ok := p.lines[fmt.Sprintf("links[%d].%s", i, key)]; ok {
				return line
			}
			return l.Line
		}
		if err := linkStrandsRange.CheckInt(int64(l.Strands)); err != nil {
			bad(at("strands"), "links.strands", "%w", err)
		}
		if l.Growth != nil {
			if err := growthRange.Check(*l.Growth); err != nil {
				bad(at("growth"), "links.growth", "%w", err)
			}
		}
	}
	g := p.Design
	if g.Objective != ObjectiveCost && g.Objective != ObjectiveLength {
		bad(p.lines["design.objective"], "design.objective", "want %q or %q, got %q", ObjectiveCost, ObjectiveLength, g.Objective)
	}
	switch {
	case planRange("design.innerduct_od_mm").Check(g.InnerductODMM) != nil || planRange("design.innerduct_id_mm").Check(g.InnerductIDMM) != nil:
		// reported above
	case g.InnerductODMM == 0 && g.InnerductIDMM != 0:
		bad(p.lines["design.innerduct_id_mm"], "design.innerduct_id_mm", "want it only with design.innerduct_od_mm, got %g without", g.InnerductIDMM)
	case g.InnerductODMM > 0 && !(g.InnerductIDMM > 0 && g.InnerductIDMM < g.InnerductODMM):
		bad(p.lines["design.innerduct_id_mm"], "design.innerduct_id_mm", "want millimetres above 0 and below innerduct_od_mm (%g), got %g", g.InnerductODMM, g.InnerductIDMM)
	}
	return errs
}

// MaxStrands is the most strands a link may ask for: the largest cables hold a few thousand
// fibres.
const MaxStrands = 10000

var (
	growthRange      = input.Range{Min: 0, Max: 10, Unit: "a fraction"}
	linkStrandsRange = input.Range{Min: 0, Max: MaxStrands, Whole: true, Unit: "strands"}
)

// planNumber is a numeric key of the plan's defaults or design sections and its range.
type planNumber struct {
	key    string
	r      input.Range
	get    func(*Plan) float64
	getInt func(*Plan) int // instead of get for an integer key, so that its message shows it exactly
}

// planNumbers are the ranges of the numeric keys of the defaults and design sections, in
// file order; a sweep file's values for them are checked against the same ranges
// (SettingRange). The ends are generous: they catch NaN, infinities, overflowing integers and
// slips of unit, not unusual designs.
var planNumbers = []planNumber{
	{key: "defaults.strands", r: input.Range{Min: 1, Max: MaxStrands, Whole: true, Unit: "strands"}, getInt: func(p *Plan) int { return p.Defaults.Strands }},
	{key: "defaults.growth", r: growthRange, get: func(p *Plan) float64 { return p.Defaults.Growth }},
	{key: "design.loss_margin_db", r: input.Range{Min: 0, Max: 50, Unit: "dB"}, get: func(p *Plan) float64 { return p.Design.LossMarginDB }},
	{key: "design.max_lateral_m", r: input.Range{Min: 0, AboveMin: true, Max: 1000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.MaxLateralM }},
	{key: "design.snap_m", r: input.Range{Min: 0, AboveMin: true, Max: 100, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.SnapM }},
	{key: "design.slack_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.SlackM }},
	{key: "design.pair_loss_db", r: input.Range{Min: 0, Max: 10, Unit: "dB"}, get: func(p *Plan) float64 { return p.Design.PairLossDB }},
	{key: "design.splice_loss_db", r: input.Range{Min: 0, Max: 10, Unit: "dB"}, get: func(p *Plan) float64 { return p.Design.SpliceLossDB }},
	{key: "design.waste_pct", r: input.Range{Min: 0, Max: 100, Unit: "a percentage"}, get: func(p *Plan) float64 { return p.Design.WastePct }},
	{key: "design.slack_loop_entrance_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.SlackLoopEntranceM }},
	{key: "design.slack_loop_structure_m", r: input.Range{Min: 0, Max: 1000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.SlackLoopStructureM }},
	// A copper channel cannot be spliced, so a reel holds one at least.
	{key: "design.reel_m", r: input.Range{Min: MaxCopperChannelM, Max: 100000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.ReelM }},
	{key: "design.pull_mu", r: input.Range{Min: 0, Max: 2, Unit: "a coefficient of friction"}, get: func(p *Plan) float64 { return p.Design.PullMu }},
	// NFPA 70 allows 360° of bends per raceway run.
	{key: "design.pull_bend_deg", r: input.Range{Min: 0, AboveMin: true, Max: 360, Unit: "degrees"}, get: func(p *Plan) float64 { return p.Design.PullBendDeg }},
	{key: "design.pull_max_m", r: input.Range{Min: 0, Max: 100000, Unit: "metres"}, get: func(p *Plan) float64 { return p.Design.PullMaxM }},
	{key: "design.pull_max_swbp_n_per_m", r: input.Range{Min: 0, Max: 100000, Unit: "N/m"}, get: func(p *Plan) float64 { return p.Design.PullMaxSWBPNPerM }},
	{key: "design.innerduct_od_mm", r: input.Range{Min: 0, Max: 1000, Unit: "millimetres"}, get: func(p *Plan) float64 { return p.Design.InnerductODMM }},
	{key: "design.innerduct_id_mm", r: input.Range{Min: 0, Max: 1000, Unit: "millimetres"}, get: func(p *Plan) float64 { return p.Design.InnerductIDMM }},
}

func planRange(key string) input.Range {
	r, ok := SettingRange(key)
	if !ok {
		panic("route: no range for plan key " + key)
	}
	return r
}

// SettingRange returns the range of a numeric plan setting by dotted key
// ("design.slack_m"), and false for a key that is not numeric.
func SettingRange(key string) (input.Range, bool) {
	for _, k := range planNumbers {
		if k.key == key {
			return k.r, true
		}
	}
	return input.Range{}, false
}

// numberLines records the line of each key of the defaults and design sections and of each
// link, by key path, so that a value out of range is reported where it was written.
func numberLines(root *yaml.Node) map[string]int {
	lines := map[string]int{}
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := root.Content[i], resolveAlias(root.Content[i+1])
		lines[k.Value] = k.Line
		switch {
		case v.Kind == yaml.MappingNode:
			for j := 0; j+1 < len(v.Content); j += 2 {
				lines[k.Value+"."+v.Content[j].Value] = v.Content[j].Line
			}
		case k.Value == "links" && v.Kind == yaml.SequenceNode:
			for li, item := range v.Content {
				item = resolveAlias(item)
				for j := 0; j+1 < len(item.Content); j += 2 {
					lines[fmt.Sprintf("links[%d].%s", li, item.Content[j].Value)] = item.Content[j].Line
				}
			}
		}
	}
	return lines
}

func resolveAlias(n *yaml.Node) *yaml.Node {
	for n.Kind == yaml.AliasNode && n.Alias != nil {
		n = n.Alias
	}
	return n
}

// Path resolves a path named in the plan against the plan file's folder.
func (p *Plan) Path(name string) string {
	if name == "" || filepath.IsAbs(name) {
		return name
	}
	return filepath.Join(p.Dir, name)
}

// ErrorList is every problem of one run, reported at once.
type ErrorList struct{ Errs []error }

func (l *ErrorList) Error() string {
	s := make([]string, len(l.Errs))
	for i, e := range l.Errs {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap lets errors.Is and errors.As see every problem.
func (l *ErrorList) Unwrap() []error { return l.Errs }
