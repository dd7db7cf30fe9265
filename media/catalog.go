package media

import (
	"cmp"
	"crypto/sha256"
	_ "embed"
	"encoding/hex"
	"fmt"
	"io"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"text/tabwriter"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// Medium kinds, the values of Medium.Kind.
const (
	KindCopper     = "copper"
	KindMultimode  = "multimode"
	KindSinglemode = "singlemode"
)

// Catalog is the parsed media catalog: media with their constructions, the IEEE 802.3
// applications that run on them, and the connection loss defaults. Media and Applications
// keep file order, which is the tie-break order of the rule engine.
type Catalog struct {
	File string
	// The connection losses of field acceptance: ANSI/TIA-568.3-D's maxima for one mated
	// connector pair and one splice, in dB, which the limits of a loss test set use.
	MatedPairDB float64
	SpliceDB    float64
	// The connection losses a designer plans with: those of the specified components, in dB.
	// A plan may override them (EngineOptions).
	DesignPairDB   float64
	DesignSpliceDB float64
	// Margins is the margin policy: what each class of link keeps below its application's
	// channel insertion loss.
	Margins      MarginPolicy
	Media        []*Medium
	Applications []*Application
}

// MarginPolicy is what the catalog adds to the margin each fibre link keeps below its
// application's maximum channel insertion loss. The engine derives the rest from the channel's
// counts: what its mated pairs and splices may lose at their ANSI/TIA-568.3-D maxima beyond the
// design losses (marginParts, media/budget.go).
type MarginPolicy struct {
	MultimodeDB  float64 // fixed extra on multimode links, in dB
	SinglemodeDB float64 // fixed extra on single-mode links, in dB
	// RepairSplicesPerKm is the allowance of future repair splices per km of outside plant on
	// single-mode links (rounded up per link), each at the larger of the design and the
	// ANSI/TIA-568.3-D splice loss.
	RepairSplicesPerKm float64
}

// Medium is one cable medium, e.g. "om4".
type Medium struct {
	ID           string
	Name         string
	Kind         string // KindCopper, KindMultimode or KindSinglemode
	JacketColour string // TIA-598 premises jacket colour; "" for copper
	// Constructions in file order; a fibre medium's attenuation lives on each construction,
	// because single-mode maxima differ between inside and outside plant.
	Constructions []*Construction
	// Meets lists the media whose application tables this one may use too (the catalog's
	// grades): a higher multimode grade meets every figure of a lower one (OM4 an OM3
	// channel's, OM5 an OM4's), so an application's reach and loss pair for the lower grade
	// holds on it as well.
	Meets []string
	Line  int // line in the catalog file, for messages
}

// Fibre reports whether m is an optical fibre medium.
func (m *Medium) Fibre() bool { return m.Kind != KindCopper }

// Construction returns the construction with the given id, or nil.
func (m *Medium) Construction(id string) *Construction {
	for _, c := range m.Constructions {
		if c.ID == id {
			return c
		}
	}
	return nil
}

// Attenuation is the maximum cabled attenuation of a construction at one wavelength.
type Attenuation struct {
	WavelengthNM int
	DBPerKm      float64
}

// Construction is one way a medium is built and listed, e.g. an OFNR riser cable or an
// outside-plant loose-tube cable.
type Construction struct {
	ID           string
	Name         string
	Listing      string // NFPA 70 listing (OFNR, OFNP, CMR, CMP), "" when unlisted
	OutdoorRated bool   // may run outside buildings
	PlenumRated  bool
	// DirectBurialRated says the construction may be laid in the earth with no duct (a
	// direct-buried pathway, type buried): catalog key direct_burial_rated, false when absent.
	DirectBurialRated bool
	// MetallicMembers says a fibre construction has non-current-carrying metallic members
	// (armour, a metallic strength member or moisture barrier): a conductive optical fibre cable
	// in NFPA 70 Article 770's words, whose members are bonded or grounded where it enters a
	// building from outside (BondingEnds). Catalog key metallic_members: read from an Article 770
	// listing when the construction has one (OFC…, conductive; OFN…, nonconductive), which the
	// key may repeat but not contradict; required when it has none (MetallicFromListing).
	// Always false for copper, whose conductors take the primary protector instead.
	MetallicMembers bool
	JacketColour    string        // the medium's colour unless the construction overrides it
	Attenuation     []Attenuation // ascending wavelength; empty for copper
	// Minimum bend radius as a multiple of the cable's outside diameter, with no load and at
	// rated pulling tension.
	BendRadiusUnloadedOD float64
	BendRadiusLoadedOD   float64
	MaxPullN             float64 // maximum pulling tension, in newtons
	Sizes                []Size  // ascending count
}

// Size is one cable size of a construction. Count is the strand count, or 1 for a 4-pair
// copper cable.
type Size struct {
	Count        int
	ODMM         float64 // outside diameter, in mm (manufacturer-typical)
	WeightKgPerM float64 // in kg/m (manufacturer-typical)
	// MaxPullN is this size's rated pulling tension in newtons where it differs from its
	// construction's (ANSI/TIA-568.3-D rates indoor-outdoor cable of 12 fibres or fewer
	// lower); 0: the construction's MaxPullN. Read it through Construction.PullRatingN.
	MaxPullN float64
}

// PullRatingN is the rated pulling tension of a cable of size s of this construction, in
// newtons: the size's own rating when the catalog gives one, else the construction's. It is
// the one rating the pulling plan checks and every output prints.
func (c *Construction) PullRatingN(s Size) float64 {
	if s.MaxPullN > 0 {
		return s.MaxPullN
	}
	return c.MaxPullN
}

// AttenuationText is the construction's maximum cabled attenuation at each wavelength, as the
// outputs print it beside a loss budget: "0.50 dB/km at 1310 nm, 0.50 dB/km at 1550 nm"; ""
// for copper.
func (c *Construction) AttenuationText() string {
	parts := make([]string, len(c.Attenuation))
	for i, a := range c.Attenuation {
		parts[i] = fmt.Sprintf("%.2f dB/km at %d nm", a.DBPerKm, a.WavelengthNM)
	}
	return strings.Join(parts, ", ")
}

// AttenDBPerKm is the maximum cabled attenuation at wavelength nm, in dB/km, and whether the
// catalog gives one.
func (c *Construction) AttenDBPerKm(nm int) (float64, bool) {
	for _, a := range c.Attenuation {
		if a.WavelengthNM == nm {
			return a.DBPerKm, true
		}
	}
	return 0, false
}

// BendRadiusMM is the minimum bend radius in mm of cable size s, with no load or at rated
// pulling tension when loaded.
func (c *Construction) BendRadiusMM(s Size, loaded bool) float64 {
	if loaded {
		return c.BendRadiusLoadedOD * s.ODMM
	}
	return c.BendRadiusUnloadedOD * s.ODMM
}

// Application is one IEEE 802.3 PHY and where it runs.
type Application struct {
	Name          string // e.g. "10GBASE-SR"
	Clause        string // IEEE 802.3 clause, e.g. "52"
	RateGbps      float64
	WavelengthsNM []int // operating wavelengths, ascending; empty for copper
	Strands       int   // fibres used (2 duplex, 8 parallel), or 4-pair cables for copper
	Transceiver   string
	// MinLossDB is the least channel insertion loss the receiver takes, in dB: the transmitter's
	// largest launch power less the receiver's largest input power; 0 when the receiver takes
	// the largest launch. A channel with less loss needs an attenuator.
	MinLossDB float64
	Reach     []Reach // in file order
	Line      int     // line in the catalog file, for messages
}

// Reach is an application's operating range and channel insertion loss on one medium.
type Reach struct {
	Medium    string
	RangeM    float64 // operating range, in metres
	MaxLossDB float64 // maximum channel insertion loss, in dB; 0 for copper
}

// On returns the application's reach on medium, and whether it runs on it at all.
func (a *Application) On(medium string) (Reach, bool) {
	for _, r := range a.Reach {
		if r.Medium == medium {
			return r, true
		}
	}
	return Reach{}, false
}

// ReachesOn is every reach-and-loss pair application a may use on medium: its own entry for
// the medium first, then those of the media the medium meets (Medium.Meets), transitively,
// in that order; empty when a runs on none of them. Reach.Medium names the table used.
func (c *Catalog) ReachesOn(a *Application, medium string) []Reach {
	var out []Reach
	seen := map[string]bool{}
	queue := []string{medium}
	for len(queue) > 0 {
		id := queue[0]
		queue = queue[1:]
		if seen[id] {
			continue
		}
		seen[id] = true
		if r, ok := a.On(id); ok {
			out = append(out, r)
		}
		if m := c.Medium(id); m != nil {
			queue = append(queue, m.Meets...)
		}
	}
	return out
}

// Medium returns the medium with the given id, or nil.
func (c *Catalog) Medium(id string) *Medium {
	for _, m := range c.Media {
		if m.ID == id {
			return m
		}
	}
	return nil
}

// Application returns the application with the given name, or nil.
func (c *Catalog) Application(name string) *Application {
	for _, a := range c.Applications {
		if a.Name == name {
			return a
		}
	}
	return nil
}

// Rates returns the distinct application rates in Gbit/s, ascending.
func (c *Catalog) Rates() []float64 {
	var rates []float64
	for _, a := range c.Applications {
		if !containsRate(rates, a.RateGbps) {
			rates = append(rates, a.RateGbps)
		}
	}
	sort.Float64s(rates)
	return rates
}

func containsRate(rates []float64, r float64) bool {
	for _, x := range rates {
		if x == r {
			return true
		}
	}
	return false
}

// FormatRate writes a rate in Gbit/s the way ParseRate reads it, e.g. "10G" or "2.5G".
func FormatRate(rateGbps float64) string {
	return strconv.FormatFloat(rateGbps, 'f', -1, 64) + "G"
}

func rateList(rates []float64) string {
	s := make([]string, len(rates))
	for i, r := range rates {
		s[i] = FormatRate(r)
	}
	return strings.Join(s, ", ")
}

var rateRE = regexp.MustCompile(`^([0-9]+(?:\.[0-9]+)?)\s*(?:[gG](?:b(?:ps|it/s|/s)?)?)?$`)

// ParseRate reads a data rate such as "10G", "100G" or "2.5G" (a bare number is Gbit/s) and
// returns it in Gbit/s. It is an error when no application of c runs at that rate; the
// message lists the rates c offers.
func (c *Catalog) ParseRate(s string) (float64, error) {
	m := rateRE.FindStringSubmatch(strings.TrimSpace(s))
	if m == nil {
		return 0, input.Errorf(ErrBadValue, "rate %q: want a rate such as 10G; the catalog has %s", s, rateList(c.Rates()))
	}
	r, _ := strconv.ParseFloat(m[1], 64)
	if !containsRate(c.Rates(), r) {
		return 0, input.Errorf(ErrBadValue, "rate %q: no application runs at %s; the catalog has %s", s, FormatRate(r), rateList(c.Rates()))
	}
	return r, nil
}

// RateText is rate s as every output writes it, FormatRate's one form ("10G" for "10Gb",
// "10 Gbps", "10g" or "10"), or s as given when it is no rate (ParseRate reports it); "" for
// "" (tester 14 F8: links.csv echoed each spelling, so a sweep mixing them showed two rates).
func RateText(s string) string {
	m := rateRE.FindStringSubmatch(strings.TrimSpace(s))
	if m == nil {
		return s
	}
	r, _ := strconv.ParseFloat(m[1], 64)
	return FormatRate(r)
}

// ParseRate reads a rate against the default catalog; see Catalog.ParseRate.
func ParseRate(s string) (float64, error) { return defaultCatalog().ParseRate(s) }

//go:embed catalog.yaml
var catalogYAML []byte

// DefaultCatalogFile is the name the embedded catalog goes by in messages.
const DefaultCatalogFile = "catalog.yaml (embedded)"

var sharedCatalog = mustOnce(func() (*Catalog, error) { return ParseCatalog(DefaultCatalogFile, catalogYAML) })

func defaultCatalog() *Catalog { return sharedCatalog() }

// DefaultCatalog returns a fresh copy of the embedded catalog, which the caller may change.
// It panics if the embedded file is invalid, which the package tests rule out.
func DefaultCatalog() *Catalog {
	c, err := ParseCatalog(DefaultCatalogFile, catalogYAML)
	if err != nil {
		panic("media: embedded catalog: " + err.Error())
	}
	return c
}

// mustOnce runs f once, on first use, and panics with its error: for embedded files only.
func mustOnce[T any](f func() (T, error)) func() T {
	var (
		once sync.Once
		v    T
	)
	return func() T {
		once.Do(func() {
			var err error
			if v, err = f(); err != nil {
				panic("media: embedded file: " + err.Error())
			}
		})
		return v
	}
}

// LoadCatalog reads and validates a catalog file.
func LoadCatalog(path string) (*Catalog, error) {
	data, err := readFile(path)
	if err != nil {
		return nil, err
	}
	return ParseCatalog(path, data)
}

// The catalog file as written; see catalog.yaml for the meaning of each key.
type catalogFile struct {
	Pos          pos                 `yaml:"-"`
	Shared       yaml.Node           `yaml:"shared"`
	Connections  connectionsYAML     `yaml:"connections"`
	Margins      marginsYAML         `yaml:"margins"`
	Grades       map[string][]string `yaml:"grades"`
	Media        []mediumYAML        `yaml:"media" item:"medium"`
	Applications []applicationYAML   `yaml:"applications" item:"application"`
}

type connectionsYAML struct {
	Pos            pos     `yaml:"-"`
	MatedPairDB    float64 `yaml:"mated_pair_db" range:"db"`
	SpliceDB       float64 `yaml:"splice_db" range:"db"`
	DesignPairDB   float64 `yaml:"design_pair_db" range:"db"`
	DesignSpliceDB float64 `yaml:"design_splice_db" range:"db"`
}

type marginsYAML struct {
	Pos          pos     `yaml:"-"`
	MultimodeDB  float64 `yaml:"extra_multimode_db" range:"db"`
	SinglemodeDB float64 `yaml:"extra_singlemode_db" range:"db"`
	// OldMultimodeDB and OldSinglemodeDB are the keys of these margins before they were
	// derived from the channel (2026-12-06), when they held what is derived now: read only to
	// refuse them (retiredMargins), never silently added on top.
	OldMultimodeDB     float64 `yaml:"multimode_db" range:"db"`
	OldSinglemodeDB    float64 `yaml:"singlemode_db" range:"db"`
	RepairSplicesPerKm float64 `yaml:"repair_splices_per_km" range:"per-km"`
}

type mediumYAML struct {
	Pos           pos                `yaml:"-"`
	ID            string             `yaml:"id"`
	Name          string             `yaml:"name"`
	Kind          string             `yaml:"kind"`
	JacketColour  string             `yaml:"jacket_colour"`
	Attenuation   map[int]float64    `yaml:"attenuation_db_per_km" range:"db-per-km" keyrange:"nm"`
	Constructions []constructionYAML `yaml:"constructions" item:"construction"`
}

type constructionYAML struct {
	Pos                  pos             `yaml:"-"`
	ID                   string          `yaml:"id"`
	Name                 string          `yaml:"name"`
	Listing              string          `yaml:"listing"`
	OutdoorRated         bool            `yaml:"outdoor_rated"`
	PlenumRated          bool            `yaml:"plenum_rated"`
	DirectBurialRated    bool            `yaml:"direct_burial_rated"`
	MetallicMembers      bool            `yaml:"metallic_members"`
	JacketColour         string          `yaml:"jacket_colour"`
	Attenuation          map[int]float64 `yaml:"attenuation_db_per_km" range:"db-per-km" keyrange:"nm"`
	BendRadiusUnloadedOD float64         `yaml:"bend_radius_unloaded_od" range:"od"`
	BendRadiusLoadedOD   float64         `yaml:"bend_radius_loaded_od" range:"od"`
	MaxPullN             float64         `yaml:"max_pull_n" range:"newtons"`
	Sizes                []sizeYAML      `yaml:"sizes"`
}

type sizeYAML struct {
	Pos          pos     `yaml:"-"`
	Count        int     `yaml:"count" range:"count"`
	ODMM         float64 `yaml:"od_mm" range:"mm"`
	WeightKgPerM float64 `yaml:"weight_kg_per_m" range:"kg-m"`
	MaxPullN     float64 `yaml:"max_pull_n" range:"newtons"`
}

type applicationYAML struct {
	Pos           pos         `yaml:"-"`
	Name          string      `yaml:"name"`
	Clause        string      `yaml:"clause"`
	RateGbps      float64     `yaml:"rate_gbps" range:"gbps"`
	WavelengthsNM []int       `yaml:"wavelengths_nm" range:"nm"`
	Strands       int         `yaml:"strands" range:"count"`
	Transceiver   string      `yaml:"transceiver"`
	MinLossDB     float64     `yaml:"min_loss_db" range:"db"`
	Media         []reachYAML `yaml:"media" item:"on"`
}

type reachYAML struct {
	Pos       pos     `yaml:"-"`
	Medium    string  `yaml:"medium"`
	RangeM    float64 `yaml:"range_m" range:"reach-m"`
	MaxLossDB float64 `yaml:"max_loss_db" range:"db"`
}

var idRE = regexp.MustCompile(`^[a-z0-9][a-z0-9-]*$`)

// checker reports validation problems of one file at a key's position.
type checker struct {
	file string
	errs *input.Problems
}

func (c checker) bad(p pos, item, field string, sentinel error, format string, args ...any) {
	line, col := p.At(lastKey(field))
	c.badAt(line, col, item, field, sentinel, format, args...)
}

// badAt reports a problem at a position, unless the decoder already reported one for the
// same item and field (a value of the wrong type is not also reported as out of range).
func (c checker) badAt(line, col int, item, field string, sentinel error, format string, args ...any) {
	if c.reported(item, field) {
		return
	}
	c.errs.Add(&input.Problem{File: c.file, Line: line, Col: col, Item: item, Key: field,
		Err: input.Errorf(sentinel, format, args...)})
}

func (c checker) reported(item, field string) bool {
	for _, p := range c.errs.List {
		if p.File == c.file && p.Item == item && p.Key == field {
			return true
		}
	}
	return false
}

// lastKey is the key of a field path's last step: "sizes[2].od_mm" → "od_mm".
func lastKey(field string) string {
	if i := strings.LastIndexByte(field, '.'); i >= 0 {
		field = field[i+1:]
	}
	if i := strings.IndexByte(field, '['); i >= 0 {
		field = field[:i]
	}
	return field
}

// require reports key missing from the mapping at p.
func (c checker) require(p pos, item string, keys ...string) bool {
	ok := true
	for _, k := range keys {
		if !p.Has(k) {
			ok = false
			if c.reported(item, k) {
				continue
			}
			c.errs.Add(&input.Problem{File: c.file, Line: p.Line, Col: p.Col, Item: item, Key: k, Err: input.Errorf(ErrMissingField, "missing")})
		}
	}
	return ok
}

// ParseCatalog reads a catalog from data; name is the file name used in messages. Every
// problem is reported at once in an *input.Problems, each naming the file, line,
// item and field.
func ParseCatalog(name string, data []byte) (*Catalog, error) {
	var errs input.Problems
	var f catalogFile
	newDecoder(name, &errs).Parse(data, &f)
	if errs.Len() > 0 && f.Pos.Keys == nil {
		return nil, sorted(&errs)
	}
	c := checker{file: name, errs: &errs}
	cn := f.Connections
	cat := &Catalog{File: name, MatedPairDB: cn.MatedPairDB, SpliceDB: cn.SpliceDB,
		DesignPairDB: cn.MatedPairDB, DesignSpliceDB: cn.SpliceDB,
		Margins: MarginPolicy{MultimodeDB: f.Margins.MultimodeDB, SinglemodeDB: f.Margins.SinglemodeDB,
			RepairSplicesPerKm: f.Margins.RepairSplicesPerKm}}
	// A catalog without design values plans with the acceptance maxima.
	if cn.Pos.Has("design_pair_db") {
		cat.DesignPairDB = cn.DesignPairDB
	}
	if cn.Pos.Has("design_splice_db") {
		cat.DesignSpliceDB = cn.DesignSpliceDB
	}
	c.require(f.Pos, "", "connections", "media", "applications")
	for _, k := range []string{"multimode_db", "singlemode_db"} {
		if f.Margins.Pos.Has(k) {
			// Review 21 F6: a catalog written before held the margin that is now derived in
			// these keys (0.5 dB, the two pairs' gap to their maxima); read as an extra it
			// would count that gap twice, and multimode reach would shrink without a word.
			c.bad(f.Margins.Pos, "margins", k, ErrBadValue,
				"no longer read: since 2026-12-06 the margin of each link is derived from its mated pairs and splices (what each may lose at its maximum, connections.mated_pair_db and splice_db, beyond its design loss), which is what this key held; remove it, or write extra_%s for a margin on top of that", k)
		}
	}
	if f.Pos.Has("connections") && c.require(cn.Pos, "connections", "mated_pair_db", "splice_db") {
		for _, v := range []struct {
			key string
			db  float64
		}{{"mated_pair_db", cn.MatedPairDB}, {"splice_db", cn.SpliceDB}, {"design_pair_db", cn.DesignPairDB}, {"design_splice_db", cn.DesignSpliceDB}} {
			if v.db < 0 {
				c.bad(cn.Pos, "connections", v.key, ErrBadValue, "want dB >= 0, got %g", v.db)
			}
		}
	}
	seen := map[string]int{}
	declared := map[string]bool{} // media ids in the file, valid or not, so that one bad medium is not also reported by every application on it
	for _, my := range f.Media {
		declared[my.ID] = true
	}
	for i, my := range f.Media {
		item := "medium " + itemLabel(my.ID, i)
		m := c.medium(my, item)
		if m == nil {
			continue
		}
		if first, dup := seen[m.ID]; dup {
			c.bad(my.Pos, item, "id", ErrDuplicateID, "medium %q already defined at line %d", m.ID, first)
			continue
		}
		seen[m.ID] = my.Pos.Line
		cat.Media = append(cat.Media, m)
	}
	c.grades(f.Pos, f.Grades, cat, declared)
	seenApp := map[string]int{}
	for i, ay := range f.Applications {
		item := "application " + itemLabel(ay.Name, i)
		a := c.application(ay, item, cat, declared)
		if a == nil {
			continue
		}
		if first, dup := seenApp[a.Name]; dup {
			c.bad(ay.Pos, item, "name", ErrDuplicateID, "application %q already defined at line %d", a.Name, first)
			continue
		}
		seenApp[a.Name] = ay.Pos.Line
		cat.Applications = append(cat.Applications, a)
	}
	if err := sorted(&errs); err != nil {
		return nil, err
	}
	return cat, nil
}

// grades sets Medium.Meets from the catalog's grades section, checking that each entry names
// a medium and other media of its kind.
func (c checker) grades(p pos, grades map[string][]string, cat *Catalog, declared map[string]bool) {
	for _, id := range sortedStrings(grades) {
		m := cat.Medium(id)
		if m == nil {
			if !declared[id] {
				c.badPath(p, "grades", []string{id}, "no medium %q in the catalog", id)
			}
			continue
		}
		ok := true
		for _, lower := range grades[id] {
			o := cat.Medium(lower)
			switch {
			case o == nil:
				c.badPath(p, "grades", []string{id}, "no medium %q in the catalog", lower)
				ok = false
			case o == m:
				c.badPath(p, "grades", []string{id}, "a medium meets its own figures; name a lower grade")
				ok = false
			case o.Kind != m.Kind:
				c.badPath(p, "grades", []string{id}, "%q is %s, %q is %s: a medium meets only media of its kind", id, m.Kind, lower, o.Kind)
				ok = false
			}
		}
		if ok {
			m.Meets = append([]string(nil), grades[id]...)
		}
	}
}

func itemLabel(id string, i int) string {
	if id == "" {
		return fmt.Sprintf("#%d", i)
	}
	return strconv.Quote(id)
}

func (c checker) medium(my mediumYAML, item string) *Medium {
	if !c.require(my.Pos, item, "id", "name", "kind", "constructions") {
		return nil
	}
	ok := true
	if !idRE.MatchString(my.ID) {
		c.bad(my.Pos, item, "id", ErrBadValue, "want lower-case letters, digits and '-', got %q", my.ID)
		ok = false
	}
	m := &Medium{ID: my.ID, Name: my.Name, Kind: my.Kind, JacketColour: my.JacketColour, Line: my.Pos.Line}
	switch my.Kind {
	case KindCopper:
		if len(my.Attenuation) > 0 {
			c.bad(my.Pos, item, "attenuation_db_per_km", ErrBadValue, "copper has no optical attenuation; remove the key")
			ok = false
		}
	case KindMultimode, KindSinglemode:
		if !my.Pos.Has("jacket_colour") {
			c.require(my.Pos, item, "jacket_colour")
			ok = false
		}
	default:
		c.bad(my.Pos, item, "kind", ErrBadValue, "want %s, %s or %s, got %q", KindCopper, KindMultimode, KindSinglemode, my.Kind)
		return nil
	}
	if !c.attenuation(my.Pos, item, "attenuation_db_per_km", my.Attenuation) {
		ok = false
	}
	seen := map[string]bool{}
	for j, cy := range my.Constructions {
		citem := item + " construction " + itemLabel(cy.ID, j)
		k := c.construction(cy, citem, m, my.Attenuation)
		if k == nil {
			ok = false
			continue
		}
		if seen[k.ID] {
			c.bad(cy.Pos, citem, "id", ErrDuplicateID, "construction %q repeated in medium %q", k.ID, m.ID)
			ok = false
			continue
		}
		seen[k.ID] = true
		m.Constructions = append(m.Constructions, k)
	}
	if len(my.Constructions) == 0 {
		c.bad(my.Pos, item, "constructions", ErrMissingField, "want at least one construction")
		ok = false
	}
	if !ok {
		return nil
	}
	return m
}

// attenuation checks a wavelength → dB/km map.
func (c checker) attenuation(p pos, item, field string, a map[int]float64) bool {
	ok := true
	for _, nm := range sortedInts(a) {
		line, col := nestedLine(p, field, nm)
		sub := fmt.Sprintf("%s.%d", field, nm)
		if nm <= 0 {
			c.badAt(line, col, item, sub, ErrBadValue, "want a wavelength in nm > 0, got %d", nm)
			ok = false
		}
		if v := a[nm]; v < 0 {
			c.badAt(line, col, item, sub, ErrBadValue, "want attenuation in dB/km >= 0, got %g", v)
			ok = false
		}
	}
	return ok
}

// nestedLine is the position of key sub inside the map held by key: the decoder records
// only a mapping's own keys, so nested entries are found on the key's value node.
func nestedLine(p pos, key string, sub int) (int, int) {
	k, ok := p.Keys[key]
	if !ok || k.Value == nil {
		return p.Line, p.Col
	}
	n := input.Resolve(k.Value)
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == strconv.Itoa(sub) {
			return n.Content[i].Line, n.Content[i].Column
		}
	}
	return k.Line, k.Col
}

func sortedInts[V any](m map[int]V) []int {
	keys := make([]int, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Ints(keys)
	return keys
}

func (c checker) construction(cy constructionYAML, item string, m *Medium, mediumAtten map[int]float64) *Construction {
	if !c.require(cy.Pos, item, "id", "name", "outdoor_rated", "bend_radius_unloaded_od", "bend_radius_loaded_od", "max_pull_n", "sizes") {
		return nil
	}
	ok := true
	if !idRE.MatchString(cy.ID) {
		c.bad(cy.Pos, item, "id", ErrBadValue, "want lower-case letters, digits and '-', got %q", cy.ID)
		ok = false
	}
	k := &Construction{ID: cy.ID, Name: cy.Name, Listing: cy.Listing, OutdoorRated: cy.OutdoorRated,
		PlenumRated: cy.PlenumRated, DirectBurialRated: cy.DirectBurialRated, JacketColour: m.JacketColour,
		BendRadiusUnloadedOD: cy.BendRadiusUnloadedOD, BendRadiusLoadedOD: cy.BendRadiusLoadedOD, MaxPullN: cy.MaxPullN}
	if cy.Pos.Has("jacket_colour") {
		k.JacketColour = cy.JacketColour
	}
	if !c.metallic(cy, item, m, k) {
		ok = false
	}
	if m.Kind == KindCopper && len(cy.Attenuation) > 0 {
		c.bad(cy.Pos, item, "attenuation_db_per_km", ErrBadValue, "copper has no optical attenuation; remove the key")
		ok = false
	}
	if !c.attenuation(cy.Pos, item, "attenuation_db_per_km", cy.Attenuation) {
		ok = false
	}
	merged := map[int]float64{}
	for nm, v := range mediumAtten {
		merged[nm] = v
	}
	for nm, v := range cy.Attenuation {
		merged[nm] = v
	}
	for _, nm := range sortedInts(merged) {
		k.Attenuation = append(k.Attenuation, Attenuation{WavelengthNM: nm, DBPerKm: merged[nm]})
	}
	if m.Kind != KindCopper && len(k.Attenuation) == 0 {
		c.bad(cy.Pos, item, "attenuation_db_per_km", ErrMissingField, "a fibre construction needs attenuation at one wavelength at least, on it or on its medium")
		ok = false
	}
	for _, f := range []struct {
		key string
		v   float64
	}{{"bend_radius_unloaded_od", cy.BendRadiusUnloadedOD}, {"bend_radius_loaded_od", cy.BendRadiusLoadedOD}, {"max_pull_n", cy.MaxPullN}} {
		if f.v <= 0 {
			c.bad(cy.Pos, item, f.key, ErrBadValue, "want a number > 0, got %g", f.v)
			ok = false
		}
	}
	if len(cy.Sizes) == 0 {
		c.bad(cy.Pos, item, "sizes", ErrMissingField, "want at least one size")
		ok = false
	}
	counts := map[int]bool{}
	for j, sy := range cy.Sizes {
		field := fmt.Sprintf("sizes[%d]", j)
		if !c.require(sy.Pos, item, "count", "od_mm", "weight_kg_per_m") {
			ok = false
			continue
		}
		if sy.Count <= 0 || counts[sy.Count] {
			c.bad(sy.Pos, item, field+".count", ErrBadValue, "want a count > 0 not listed before, got %d", sy.Count)
			ok = false
		}
		if m.Kind == KindCopper && sy.Count != 1 {
			c.bad(sy.Pos, item, field+".count", ErrBadValue, "copper is listed per 4-pair cable: want count 1, got %d", sy.Count)
			ok = false
		}
		counts[sy.Count] = true
		if sy.ODMM <= 0 {
			c.bad(sy.Pos, item, field+".od_mm", ErrBadValue, "want mm > 0, got %g", sy.ODMM)
			ok = false
		}
		if sy.WeightKgPerM <= 0 {
			c.bad(sy.Pos, item, field+".weight_kg_per_m", ErrBadValue, "want kg/m > 0, got %g", sy.WeightKgPerM)
			ok = false
		}
		if sy.MaxPullN < 0 {
			c.bad(sy.Pos, item, field+".max_pull_n", ErrBadValue, "want newtons > 0, or no max_pull_n for the construction's, got %g", sy.MaxPullN)
			ok = false
		}
		k.Sizes = append(k.Sizes, Size{Count: sy.Count, ODMM: sy.ODMM, WeightKgPerM: sy.WeightKgPerM, MaxPullN: sy.MaxPullN})
	}
	sort.Slice(k.Sizes, func(i, j int) bool { return k.Sizes[i].Count < k.Sizes[j].Count })
	if !ok {
		return nil
	}
	return k
}

// MetallicFromListing is what an NFPA 70 Article 770 listing says of a fibre cable's metallic
// members: OFC, OFCG, OFCR and OFCP (conductive) have them, OFN, OFNG, OFNR and OFNP
// (nonconductive) have none, a suffix such as -LS aside (NFPA 70 Article 770, listings, seen);
// known is false for no listing or another one, where the catalog must say
// (metallic_members).
func MetallicFromListing(listing string) (metallic, known bool) {
	switch {
	case strings.HasPrefix(listing, "OFC"):
		return true, true
	case strings.HasPrefix(listing, "OFN"):
		return false, true
	}
	return false, false
}

// metallic sets k.MetallicMembers from cy's listing and metallic_members, or reports what is
// wrong: the key on copper, a key that contradicts the listing, or no key where the listing
// does not tell. An unlisted fibre construction must say: outside-plant cable is made both
// all-dielectric and armoured, and either guess is wrong on some bill (one without the
// bonding the code asks for, or one with bonding a dielectric cable does not take).
func (c checker) metallic(cy constructionYAML, item string, m *Medium, k *Construction) bool {
	has := cy.Pos.Has("metallic_members")
	if m.Kind == KindCopper {
		if has {
			c.bad(cy.Pos, item, "metallic_members", ErrBadValue, "copper conductors are metal themselves and take a primary protector where they enter a building from outside; remove the key")
			return false
		}
		return true
	}
	fromListing, known := MetallicFromListing(cy.Listing)
	switch {
	case known && has && cy.MetallicMembers != fromListing:
		kind := map[bool]string{true: "conductive (it has metallic members)", false: "nonconductive (no metallic members)"}[fromListing]
		c.bad(cy.Pos, item, "metallic_members", ErrBadValue, "listing %s is %s under NFPA 70 Article 770; want metallic_members: %t, or no key", cy.Listing, kind, fromListing)
		return false
	case known:
		k.MetallicMembers = fromListing
	case !has:
		what := "it has no NFPA 70 Article 770 listing"
		if cy.Listing != "" {
			what = fmt.Sprintf("its listing %q is not one of Article 770's (OFN…, OFC…)", cy.Listing)
		}
		c.bad(cy.Pos, item, "metallic_members", ErrMissingField, "missing: %s, so say whether the cable has metallic members (armour, a metallic strength member or moisture barrier): metallic_members: true, which bills their bonding at each building it enters from outside, or false for an all-dielectric cable", what)
		return false
	default:
		k.MetallicMembers = cy.MetallicMembers
	}
	return true
}

func (c checker) application(ay applicationYAML, item string, cat *Catalog, declared map[string]bool) *Application {
	if !c.require(ay.Pos, item, "name", "rate_gbps", "strands", "transceiver", "media") {
		return nil
	}
	ok := true
	a := &Application{Name: ay.Name, Clause: ay.Clause, RateGbps: ay.RateGbps, Strands: ay.Strands,
		Transceiver: ay.Transceiver, MinLossDB: ay.MinLossDB, Line: ay.Pos.Line}
	if ay.RateGbps <= 0 {
		c.bad(ay.Pos, item, "rate_gbps", ErrBadValue, "want Gbit/s > 0, got %g", ay.RateGbps)
		ok = false
	}
	if ay.Strands <= 0 {
		c.bad(ay.Pos, item, "strands", ErrBadValue, "want a count > 0, got %d", ay.Strands)
		ok = false
	}
	if strings.TrimSpace(ay.Transceiver) == "" {
		c.bad(ay.Pos, item, "transceiver", ErrBadValue, "want a price key, got an empty string")
		ok = false
	}
	for j, nm := range ay.WavelengthsNM {
		if nm <= 0 {
			c.bad(ay.Pos, item, fmt.Sprintf("wavelengths_nm[%d]", j), ErrBadValue, "want nm > 0, got %d", nm)
			ok = false
		}
	}
	a.WavelengthsNM = append([]int(nil), ay.WavelengthsNM...)
	sort.Ints(a.WavelengthsNM)
	if len(ay.Media) == 0 {
		c.bad(ay.Pos, item, "media", ErrMissingField, "want the media it runs on")
		ok = false
	}
	kinds := map[bool]bool{}
	seen := map[string]bool{}
	for j, ry := range ay.Media {
		ritem := item + " on " + itemLabel(ry.Medium, j)
		if !c.require(ry.Pos, ritem, "medium", "range_m") {
			ok = false
			continue
		}
		m := cat.Medium(ry.Medium)
		if m == nil {
			if !declared[ry.Medium] {
				c.bad(ry.Pos, ritem, "medium", ErrUnknownReference, "no medium %q in the catalog", ry.Medium)
			}
			ok = false
			continue
		}
		if seen[m.ID] {
			c.bad(ry.Pos, ritem, "medium", ErrDuplicateID, "medium %q listed twice", m.ID)
			ok = false
			continue
		}
		seen[m.ID] = true
		kinds[m.Fibre()] = true
		if ry.RangeM <= 0 {
			c.bad(ry.Pos, ritem, "range_m", ErrBadValue, "want metres > 0, got %g", ry.RangeM)
			ok = false
		}
		if m.Fibre() {
			if !c.require(ry.Pos, ritem, "max_loss_db") {
				ok = false
			} else if ry.MaxLossDB <= 0 {
				c.bad(ry.Pos, ritem, "max_loss_db", ErrBadValue, "want dB > 0, got %g", ry.MaxLossDB)
				ok = false
			}
			if len(a.WavelengthsNM) == 0 {
				c.bad(ay.Pos, item, "wavelengths_nm", ErrMissingField, "an application on fibre %q needs its operating wavelengths", m.ID)
				ok = false
			}
			for _, nm := range a.WavelengthsNM {
				for _, k := range m.Constructions {
					if _, has := k.AttenDBPerKm(nm); !has {
						c.bad(ay.Pos, item, "wavelengths_nm", ErrUnknownReference, "medium %q construction %q has no attenuation at %d nm", m.ID, k.ID, nm)
						ok = false
					}
				}
			}
		} else if ry.Pos.Has("max_loss_db") {
			c.bad(ry.Pos, ritem, "max_loss_db", ErrBadValue, "copper has no optical loss budget; remove the key")
			ok = false
		}
		a.Reach = append(a.Reach, Reach{Medium: m.ID, RangeM: ry.RangeM, MaxLossDB: ry.MaxLossDB})
	}
	if len(kinds) > 1 {
		c.bad(ay.Pos, item, "media", ErrBadValue, "an application runs on copper or on fibre, not both")
		ok = false
	}
	if kinds[false] && len(a.WavelengthsNM) > 0 {
		c.bad(ay.Pos, item, "wavelengths_nm", ErrBadValue, "a copper application has no wavelength; remove the key")
		ok = false
	}
	if !ok {
		return nil
	}
	return a
}

// Table writes the reach-and-loss table: one row per application and medium, in catalog
// order, with rate, operating wavelengths, fibres or cables used, operating range in metres,
// maximum channel insertion loss in dB, the least loss the receiver takes in dB and the
// medium's TIA-598 jacket colour; then the maximum cabled attenuation in dB/km at each
// wavelength of each fibre medium listed, by construction, which every loss budget counts;
// then the connection losses
// (field and design), the margin policy and the grades that meet lower ones. rateGbps 0 lists every rate; any other rate
// must be one the catalog offers.
func (c *Catalog) Table(w io.Writer, rateGbps float64) error {
	if rateGbps != 0 && !containsRate(c.Rates(), rateGbps) {
		return input.Errorf(ErrBadValue, "no application runs at %s; the catalog has %s", FormatRate(rateGbps), rateList(c.Rates()))
	}
	shown := map[string]bool{} // the media the table lists
	tw := tabwriter.NewWriter(w, 0, 8, 2, ' ', 0)
	fmt.Fprintln(tw, "application\tIEEE 802.3 clause\trate\twavelength nm\tuses\tmedium\trange m\tmax channel loss dB\tmin channel loss dB\tjacket")
	for _, a := range c.Applications {
		if rateGbps != 0 && a.RateGbps != rateGbps {
			continue
		}
		for _, m := range c.Media {
			r, ok := a.On(m.ID)
			if !ok {
				continue
			}
			wl, uses, loss, least, jacket := "-", fmt.Sprintf("%d x 4-pair cable", a.Strands), "-", "-", "-"
			if m.Fibre() {
				wl = joinInts(a.WavelengthsNM, "/")
				uses = fmt.Sprintf("%d fibres", a.Strands)
				loss = fmt.Sprintf("%.2f", r.MaxLossDB)
				least = fmt.Sprintf("%.2f", a.MinLossDB)
			}
			if m.JacketColour != "" {
				jacket = m.JacketColour
			}
			clause := "-"
			if a.Clause != "" {
				clause = a.Clause
			}
			shown[m.ID] = true
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%.0f\t%s\t%s\t%s\n", a.Name, clause, FormatRate(a.RateGbps), wl, uses, m.ID, r.RangeM, loss, least, jacket)
		}
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	// The attenuation every loss budget counts, a table of its own (its columns are not the
	// applications'), when the table lists a fibre medium.
	fibre := false
	for _, m := range c.Media {
		fibre = fibre || (m.Fibre() && shown[m.ID])
	}
	tw = tabwriter.NewWriter(w, 0, 8, 2, ' ', 0)
	if fibre {
		fmt.Fprintln(tw)
		fmt.Fprintln(tw, "medium\tconstructions\tmax cabled attenuation, which every loss budget counts")
	}
	for _, m := range c.Media {
		if !m.Fibre() || !shown[m.ID] {
			continue
		}
		// The constructions of one attenuation together, in catalog order of the first.
		var texts []string
		ids := map[string][]string{}
		for _, k := range m.Constructions {
			if t := k.AttenuationText(); t != "" {
				if ids[t] == nil {
					texts = append(texts, t)
				}
				ids[t] = append(ids[t], k.ID)
			}
		}
		for _, t := range texts {
			fmt.Fprintf(tw, "%s\t%s\t%s\n", m.ID, strings.Join(ids[t], ", "), t)
		}
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if err := c.constructionTable(w, shown); err != nil {
		return err
	}
	var meets []string
	for _, m := range c.Media {
		if len(m.Meets) > 0 {
			meets = append(meets, m.ID+" also uses "+strings.Join(m.Meets, ", ")+"'s figures")
		}
	}
	lines := []string{
		fmt.Sprintf("connections: field acceptance (ANSI/TIA-568.3-D maxima) mated pair %.2f dB, splice %.2f dB; design mated pair %.2f dB, splice %.2f dB",
			c.MatedPairDB, c.SpliceDB, c.DesignPairDB, c.DesignSpliceDB),
		fmt.Sprintf("margins: what each mated pair and splice may lose at its ANSI/TIA-568.3-D maximum beyond its design loss (%.2f dB a pair, %.2f dB a splice), "+
			"plus %.2f dB multimode, %.2f dB single-mode (extra_multimode_db, extra_singlemode_db); single-mode also %g repair splices per km of outside plant",
			max(0, c.MatedPairDB-c.DesignPairDB), max(0, c.SpliceDB-c.DesignSpliceDB), c.Margins.MultimodeDB, c.Margins.SinglemodeDB, c.Margins.RepairSplicesPerKm),
	}
	if len(meets) > 0 {
		lines = append(lines, "higher grades: "+strings.Join(meets, "; "))
	}
	lines = append(lines, "ranges and losses per IEEE 802.3, see "+c.File)
	_, err := io.WriteString(w, strings.Join(lines, "\n")+"\n")
	return err
}

// constructionTable prints the constructions of the media shown: how each is listed, whether
// it carries metal into a building (MetalText), where it may be laid and its pulling rating,
// one row per medium and construction.
func (c *Catalog) constructionTable(w io.Writer, shown map[string]bool) error {
	tw := tabwriter.NewWriter(w, 0, 8, 2, ' ', 0)
	fmt.Fprintln(tw)
	fmt.Fprintln(tw, "medium\tconstruction\tname\tlisting\tmetal in the cable\toutdoors\tplenum\tdirect burial\tpull rating N")
	yes := map[bool]string{true: "yes", false: "no"}
	for _, m := range c.Media {
		if !shown[m.ID] {
			continue
		}
		for _, k := range m.Constructions {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", m.ID, k.ID, k.Name, cmp.Or(k.Listing, "unlisted"), k.MetalText(m),
				yes[k.OutdoorRated], yes[k.PlenumRated], yes[k.DirectBurialRated], k.pullText())
		}
	}
	return tw.Flush()
}

// MetalText says in a few words what metal a construction of medium m carries into a
// building, as the media table and the bill print it: "copper conductors", "metallic members,
// bonded at entrances" (MetallicMembers) or "none, all-dielectric".
func (c *Construction) MetalText(m *Medium) string {
	switch {
	case m.Kind == KindCopper:
		return "copper conductors"
	case c.MetallicMembers:
		return "metallic members, bonded at entrances"
	}
	return "none, all-dielectric"
}

// pullText is the construction's rated pulling tension in newtons, with the sizes rated
// otherwise: "2670 (12-fibre 1335)".
func (c *Construction) pullText() string {
	t := fmt.Sprintf("%.0f", c.MaxPullN)
	var own []string
	for _, s := range c.Sizes {
		if r := c.PullRatingN(s); r != c.MaxPullN {
			own = append(own, fmt.Sprintf("%d-fibre %.0f", s.Count, r))
		}
	}
	if len(own) > 0 {
		t += " (" + strings.Join(own, ", ") + ")"
	}
	return t
}

func joinInts(v []int, sep string) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.Itoa(x)
	}
	return strings.Join(s, sep)
}

// finite reports whether x is a usable number.
func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// EmbeddedSHA256 returns the SHA-256, in hex, of the embedded catalog, rule file and demo price
// book: what a plan that names none of its own reads instead. A sweep records them so that a
// resumed sweep plans again when they change with a new build.
func EmbeddedSHA256() (catalog, rules, prices string) {
	h := func(b []byte) string { s := sha256.Sum256(b); return hex.EncodeToString(s[:]) }
	return h(catalogYAML), h(rulesYAML), h(pricesYAML)
}
