package route

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
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

// LoadPlan reads and validates a plan file.
func LoadPlan(path string) (*Plan, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, &PlanError{File: path, Err: fmt.Errorf("%w: %v", ErrPlan, err)}
	}
	return ParsePlan(path, data)
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
	if err := decodeStrict(root.Content[0], &p, name); err != nil {
		errs = append(errs, err...)
	}
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
	d := p.Defaults
	if d.Strands <= 0 {
		bad(0, "defaults.strands", "want an integer > 0, got %d", d.Strands)
	}
	if d.Growth < 0 {
		bad(0, "defaults.growth", "want a fraction >= 0, got %g", d.Growth)
	}
	if d.Redundancy != RedundancyNone && d.Redundancy != RedundancyDiverse {
		bad(0, "defaults.redundancy", "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, d.Redundancy)
	}
	for _, l := range p.Links {
		if l.To == "" {
			bad(l.Line, "links", "a link needs to: (the building served)")
		}
		if l.Redundancy != "" && l.Redundancy != RedundancyNone && l.Redundancy != RedundancyDiverse {
			bad(l.Line, "links.redundancy", "want %q or %q, got %q", RedundancyNone, RedundancyDiverse, l.Redundancy)
		}
		if l.Strands < 0 {
			bad(l.Line, "links.strands", "want an integer >= 0, got %d", l.Strands)
		}
		if l.Growth != nil && *l.Growth < 0 {
			bad(l.Line, "links.growth", "want a fraction >= 0, got %g", *l.Growth)
		}
	}
	g := p.Design
	if g.LossMarginDB < 0 {
		bad(0, "design.loss_margin_db", "want dB >= 0, got %g", g.LossMarginDB)
	}
	if g.MaxLateralM <= 0 {
		bad(0, "design.max_lateral_m", "want metres > 0, got %g", g.MaxLateralM)
	}
	if g.SnapM <= 0 {
		bad(0, "design.snap_m", "want metres > 0, got %g", g.SnapM)
	}
	if g.SlackM < 0 {
		bad(0, "design.slack_m", "want metres >= 0, got %g", g.SlackM)
	}
	if g.PairLossDB < 0 {
		bad(0, "design.pair_loss_db", "want dB >= 0, got %g", g.PairLossDB)
	}
	if g.SpliceLossDB < 0 {
		bad(0, "design.splice_loss_db", "want dB >= 0, got %g", g.SpliceLossDB)
	}
	if !(g.WastePct >= 0 && g.WastePct <= 100) {
		bad(0, "design.waste_pct", "want a percentage from 0 to 100, got %g", g.WastePct)
	}
	if !(g.SlackLoopEntranceM >= 0) || math.IsInf(g.SlackLoopEntranceM, 0) {
		bad(0, "design.slack_loop_entrance_m", "want metres >= 0, got %g", g.SlackLoopEntranceM)
	}
	if !(g.SlackLoopStructureM >= 0) || math.IsInf(g.SlackLoopStructureM, 0) {
		bad(0, "design.slack_loop_structure_m", "want metres >= 0, got %g", g.SlackLoopStructureM)
	}
	if !(g.ReelM >= MaxCopperChannelM) || math.IsInf(g.ReelM, 0) {
		bad(0, "design.reel_m", "want metres >= %g (a copper channel, which cannot be spliced), got %g", MaxCopperChannelM, g.ReelM)
	}
	if !(g.PullMu >= 0 && g.PullMu <= 2) {
		bad(0, "design.pull_mu", "want a coefficient of friction from 0 to 2, got %g", g.PullMu)
	}
	if !(g.PullBendDeg > 0 && g.PullBendDeg <= 360) {
		bad(0, "design.pull_bend_deg", "want degrees above 0 and at most 360 (NFPA 70 per raceway), got %g", g.PullBendDeg)
	}
	if !(g.PullMaxM >= 0) || math.IsInf(g.PullMaxM, 0) {
		bad(0, "design.pull_max_m", "want metres >= 0 (0: no limit), got %g", g.PullMaxM)
	}
	if !(g.PullMaxSWBPNPerM >= 0) || math.IsInf(g.PullMaxSWBPNPerM, 0) {
		bad(0, "design.pull_max_swbp_n_per_m", "want N/m >= 0 (0: not checked), got %g", g.PullMaxSWBPNPerM)
	}
	if g.Objective != ObjectiveCost && g.Objective != ObjectiveLength {
		bad(0, "design.objective", "want %q or %q, got %q", ObjectiveCost, ObjectiveLength, g.Objective)
	}
	switch {
	case !(g.InnerductODMM >= 0) || math.IsInf(g.InnerductODMM, 0):
		bad(0, "design.innerduct_od_mm", "want millimetres >= 0 (0: no innerduct), got %g", g.InnerductODMM)
	case g.InnerductODMM == 0 && g.InnerductIDMM != 0:
		bad(0, "design.innerduct_id_mm", "want it only with design.innerduct_od_mm, got %g without", g.InnerductIDMM)
	case g.InnerductODMM > 0 && !(g.InnerductIDMM > 0 && g.InnerductIDMM < g.InnerductODMM):
		bad(0, "design.innerduct_id_mm", "want millimetres above 0 and below innerduct_od_mm (%g), got %g", g.InnerductODMM, g.InnerductIDMM)
	}
	return errs
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
