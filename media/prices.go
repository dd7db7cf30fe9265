package media

import (
	_ "embed"
	"fmt"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// Price items, the values of PriceKey.Item. Money items are read with PriceBook.Price, in
// cents; the labour productivity items (Rate*) with PriceBook.Rate, per hour.
const (
	PriceCable         = "cable"             // per metre of one cable: Medium, Construction, Count strands (1 for a 4-pair copper cable)
	PriceTermination   = "termination"       // per strand end (connector or pigtail) for fibre, per 4-pair cable end (jack) for copper: Medium
	PriceSpliceTray    = "splice-tray"       // each
	PriceSpliceClosure = "splice-closure"    // each
	PriceTransition    = "transition"        // each: an entrance splice enclosure where outside-plant cable meets inside cable
	PriceEnclosure     = "enclosure"         // fibre enclosure, each: Count ports
	PriceAdapterPanel  = "adapter-panel"     // each: Count ports
	PriceCopperPanel   = "copper-panel"      // copper patch panel, each: Count ports
	PriceInnerduct     = "innerduct"         // per metre
	PriceStructure     = "structure"         // each: Name pull-box, handhole or maintenance-hole
	PriceTrench        = "trench"            // per metre: Name surface (turf, asphalt, concrete)
	PriceBore          = "bore"              // directional bore, per metre
	PriceRestoration   = "restoration"       // per metre: Name surface
	PriceAddedDuct     = "added-duct"        // one more duct in a new trench or bore, per metre
	PriceNewPathway    = "new-pathway"       // per metre of a proposed pathway built neither by trench nor bore: Name its type (aerial, tray, tunnel)
	PriceLabourHour    = "labour-hour"       // one hour of labour
	PriceTransceiver   = "transceiver"       // each: Name, the catalog application's price key
	PricePatchCord     = "patch-cord"        // each, from a panel to the equipment: Medium (optional section, see PriceBook.Has)
	PriceAttenuator    = "attenuator"        // a fixed in-line optical attenuator, each: Count dB (optional section)
	PriceBidItem       = "bid-item"          // an entry of bid_items priced as a lump sum or per unit of its basis: Name its id (optional section)
	PriceEntrance      = "entrance"          // building entry, each entrance a plan uses: wall penetration, sleeve or entrance conduit, firestop (optional)
	PriceFirestop      = "entrance-firestop" // each entrance a plan uses that is there already: firestopping the cables through its sleeve (optional)
	PriceCrew          = "crew"              // crew labour, each: Name one of CrewTasks (optional section; a task it leaves out is NotPriced)
	PriceSplicePoint   = "splice-point"      // a splice point built for a mid-span splice no structure within a reel's reach takes, each (optional)
	PriceProtector     = "primary-protector" // a listed primary protector where a copper cable enters a building from outside, each cable end (optional)
	PriceHoleWall      = "hole-wall"         // new duct entering an existing maintenance hole: wall penetration, duct terminators, seal, each (optional)
	PricePoleRiser     = "pole-riser"        // a counted lateral's riser down a pole from the strand into the handhole at its foot, each (optional)
	PriceBonding       = "member-bonding"    // bonding the metallic members of a fibre cable where it enters a building from outside, each cable end (optional; BondingEnds)

	RatePull        = "pull-rate"        // metres pulled per hour: Name pathway type (duct, tunnel, aerial, buried, tray)
	RateSplice      = "splice-rate"      // splices per hour
	RateTermination = "termination-rate" // terminations per hour
	RateLossTest    = "loss-test-rate"   // strands tested with a loss test set per hour
	RateOTDRTest    = "otdr-test-rate"   // strands tested with an OTDR per hour
)

// PriceKey names one price in a price book. Only the fields the item uses are set.
type PriceKey struct {
	Item         string // a Price* or Rate* constant
	Medium       string
	Construction string
	Name         string
	Count        int
}

// String names the price in words, e.g. "cable os2 osp-loose-tube 12".
func (k PriceKey) String() string {
	parts := []string{k.Item}
	for _, s := range []string{k.Medium, k.Construction, k.Name} {
		if s != "" {
			parts = append(parts, s)
		}
	}
	if k.Count > 0 {
		parts = append(parts, strconv.Itoa(k.Count))
	}
	return strings.Join(parts, " ")
}

// Path is where the price goes in a price book file, e.g. "cable_per_m.os2.osp-loose-tube.12".
func (k PriceKey) Path() string {
	n := strconv.Itoa(k.Count)
	switch k.Item {
	case PriceCable:
		return "cable_per_m." + k.Medium + "." + k.Construction + "." + n
	case PriceTermination:
		return "termination_each." + k.Medium
	case PriceSpliceTray:
		return "splice_tray.each"
	case PriceSpliceClosure:
		return "splice_closure_each"
	case PriceTransition:
		return "transition_splice_each"
	case PriceEnclosure:
		return "fibre_enclosures." + n
	case PriceAdapterPanel:
		return "adapter_panels." + n
	case PriceCopperPanel:
		return "copper_patch_panels." + n
	case PriceInnerduct:
		return "innerduct_per_m"
	case PriceStructure:
		return "structures_each." + k.Name
	case PriceTrench:
		return "trench_per_m." + k.Name
	case PriceBore:
		return "directional_bore_per_m"
	case PriceRestoration:
		return "restoration_per_m." + k.Name
	case PriceAddedDuct:
		return "added_duct_per_m"
	case PriceNewPathway:
		return "new_pathway_per_m." + k.Name
	case PriceLabourHour:
		return "labour.hourly_rate"
	case PriceTransceiver:
		return "transceivers." + k.Name
	case PricePatchCord:
		return "patch_cords_each." + k.Medium
	case PriceAttenuator:
		return "attenuators_each." + n
	case PriceBidItem:
		return "bid_items[id " + k.Name + "]"
	case PriceEntrance:
		return "building_entrance_each"
	case PriceFirestop:
		return "entrance_firestop_each"
	case PriceCrew:
		return "crew_each." + k.Name
	case PriceSplicePoint:
		return "splice_point_each"
	case PriceProtector:
		return "primary_protector_each"
	case PriceHoleWall:
		return "maintenance_hole_entry_each"
	case PricePoleRiser:
		return "pole_riser_each"
	case PriceBonding:
		return "metallic_member_bonding_each"
	case RatePull:
		return "labour.pull_m_per_hour." + k.Name
	case RateSplice:
		return "labour.splices_per_hour"
	case RateTermination:
		return "labour.terminations_per_hour"
	case RateLossTest:
		return "labour.tests_per_hour.loss"
	case RateOTDRTest:
		return "labour.tests_per_hour.otdr"
	}
	return k.String()
}

// Crew tasks, the names of crew_each: labour as crews price it, per task done, each task
// priced only when the book prices it.
const (
	CrewPullSetup        = "pull_setup"        // setting up one pull of one cable between two pull points
	CrewStructureEntry   = "structure_entry"   // entering a maintenance hole or handhole once for one cable passing or ending there
	CrewCableEndPrep     = "cable_end_prep"    // preparing one end of one cable for termination
	CrewEnclosureInstall = "enclosure_install" // installing one fibre enclosure or copper patch panel
)

// CrewTasks are the crew tasks in a fixed order.
var CrewTasks = []string{CrewPullSetup, CrewStructureEntry, CrewCableEndPrep, CrewEnclosureInstall}

func isRate(item string) bool { return strings.HasSuffix(item, "-rate") }

// PriceBook holds the prices of a plan: money in integer cents of Currency, labour
// productivity per hour, and markups in basis points (1 bp = 0.01 %).
type PriceBook struct {
	File       string
	Label      string // e.g. "demo prices, invented, not a quotation"
	Currency   string // ISO 4217 code
	PricesDate string // YYYY-MM-DD, the date the prices hold for

	SpliceTrayStrands int // splices one tray holds

	// Termination is how termination_each terminates a fibre strand end (a Termination*
	// constant): what its price buys, and so how many splices the loss budget counts.
	Termination string

	ContingencyBP int64 // contingency on the subtotal
	OverheadBP    int64 // overhead on the subtotal
	TaxBP         int64 // tax on the taxed categories' subtotals, and on contingency and overhead when taxed
	// Taxed lists what tax applies to: categories and the markups "contingency" and
	// "overhead" (taxed_categories); all of them when the book does not say.
	Taxed []string
	// BidItems are the items a bid carries (bid_items), in file order.
	BidItems []BidItem

	money map[PriceKey]int64
	rates map[PriceKey]float64
}

// Price returns the price for k in cents and whether the book has it.
func (p *PriceBook) Price(k PriceKey) (int64, bool) {
	c, ok := p.money[k]
	return c, ok
}

// Rate returns the labour productivity for k (a Rate* item), per hour, and whether the book
// has it.
func (p *PriceBook) Rate(k PriceKey) (float64, bool) {
	r, ok := p.rates[k]
	return r, ok
}

// TraySplices is how many splices a tray holds: the book's splice_tray strands, or 12 when it
// does not say, since a book without trays fails on their price anyway.
func (p *PriceBook) TraySplices() int {
	if p.SpliceTrayStrands > 0 {
		return p.SpliceTrayStrands
	}
	return 12
}

// TraysFor is how many trays hold the given splices.
func (p *PriceBook) TraysFor(splices int) int {
	per := p.TraySplices()
	return (splices + per - 1) / per
}

// Has reports whether the book prices any key of item (a Price* or Rate* constant): a
// bill of materials leaves out an optional item, such as patch cords, only when its whole
// section is absent.
func (p *PriceBook) Has(item string) bool {
	for k := range p.money {
		if k.Item == item {
			return true
		}
	}
	for k := range p.rates {
		if k.Item == item {
			return true
		}
	}
	return false
}

// optionalItems are the price items a book may leave out whole (PriceBook.NotPriced).
var optionalItems = []string{PriceEntrance, PriceFirestop, PricePatchCord, PriceSplicePoint, PriceProtector, PriceHoleWall, PricePoleRiser, PriceBonding}

// NotPriced reports whether k is a price the book leaves out on purpose: its item is one a book
// may leave out whole (building_entrance_each, entrance_firestop_each, patch_cords_each,
// splice_point_each, primary_protector_each, maintenance_hole_entry_each, pole_riser_each,
// metallic_member_bonding_each) and the book prices no key of that item; or it is a crew task (crew_each)
// of a book that prices crews but not that task (a book without crew_each prices labour by the
// hour alone, and the plan asks it for no crew task: items.Crew). A plan still needs what such
// a price buys: Check does not ask for it, and Bill lists its quantity on a line with no price
// (BOMLine.NotPriced), as a bid lists its exclusions. It is the one place that decides that an
// optional price is absent.
func (p *PriceBook) NotPriced(k PriceKey) bool {
	switch {
	case slices.Contains(optionalItems, k.Item):
		return !p.Has(k.Item)
	case k.Item == PriceCrew:
		return p.Has(PriceCrew) && !p.has(k)
	}
	return false
}

// SectionPath is where the prices of k's item go in a price book file, the key a book leaves
// out to leave the item unpriced: "patch_cords_each" for every patch cord, else k.Path().
func (k PriceKey) SectionPath() string {
	if k.Item == PricePatchCord {
		return "patch_cords_each"
	}
	return k.Path()
}

// Keys returns every key the book prices, sorted by item, medium, construction, name and count.
func (p *PriceBook) Keys() []PriceKey {
	keys := make([]PriceKey, 0, len(p.money)+len(p.rates))
	for k := range p.money {
		keys = append(keys, k)
	}
	for k := range p.rates {
		keys = append(keys, k)
	}
	sortKeys(keys)
	return keys
}

func sortKeys(keys []PriceKey) {
	sort.Slice(keys, func(i, j int) bool { return keyLess(keys[i], keys[j]) })
}

// Check reports every key of needs the book lacks (but not those it leaves out on purpose,
// NotPriced), at once, as an *input.Problems
// with ErrMissingPrice, each naming the key and the path to add it at; nil when all are there.
func (p *PriceBook) Check(needs []PriceKey) error {
	if p.hasAll(needs) { // the usual case, without sorting or allocating
		return nil
	}
	var errs input.Problems
	seen := map[PriceKey]bool{}
	keys := append([]PriceKey(nil), needs...)
	sortKeys(keys)
	for _, k := range keys {
		if seen[k] {
			continue
		}
		seen[k] = true
		if !p.has(k) && !p.NotPriced(k) {
			errs.Add(&input.Problem{File: p.File, Item: "price " + strconv.Quote(k.String()),
				Err: input.Errorf(ErrMissingPrice, "missing; add %s%s", k.Path(), missingHint(k))})
		}
	}
	return sorted(&errs)
}

// missingHint is what a missing price k is for, when its key alone does not say: a proposed
// pathway of a type built neither by trench nor bore (tester 13's finding K: such a pathway
// was priced as turf trench).
func missingHint(k PriceKey) string {
	if k.Item != PriceNewPathway {
		return ""
	}
	what := map[string]string{"aerial": "a new pole line (poles, guys and anchors, messenger strand, lashing, make-ready)",
		"tray": "new cable tray with its supports", "tunnel": "a new utility tunnel (its civil work)"}[k.Name]
	return fmt.Sprintf(", per metre of %s: the campus has a proposed %s pathway, which the plan builds; or give it status existing if another project builds it", what, k.Name)
}

// hasAll reports whether the book prices every key of needs, or leaves it out on purpose
// (NotPriced).
func (p *PriceBook) hasAll(needs []PriceKey) bool {
	for _, k := range needs {
		if !p.has(k) && !p.NotPriced(k) {
			return false
		}
	}
	return true
}

// has reports whether the book prices k, a rate or an amount of money.
func (p *PriceBook) has(k PriceKey) bool {
	if isRate(k.Item) {
		_, ok := p.rates[k]
		return ok
	}
	_, ok := p.money[k]
	return ok
}

// ApplyBP returns bp basis points of cents, rounded half away from zero.
func ApplyBP(cents, bp int64) int64 {
	x := cents * bp
	if x >= 0 {
		return (x + 5000) / 10000
	}
	return -((-x + 5000) / 10000)
}

// FormatCents writes cents as a decimal amount with two decimals: 123456 → "1234.56".
func FormatCents(cents int64) string {
	sign := ""
	if cents < 0 {
		sign, cents = "-", -cents
	}
	return fmt.Sprintf("%s%d.%02d", sign, cents/100, cents%100)
}

// MulCents returns perUnitCents × quantity rounded half away from zero to a whole cent, e.g.
// a price per metre times a length in metres.
func MulCents(perUnitCents int64, quantity float64) int64 {
	x := float64(perUnitCents) * quantity
	if x < 0 {
		return -int64(-x + 0.5)
	}
	return int64(x + 0.5)
}

var decimalRE = regexp.MustCompile(`^[0-9][0-9_]*(\.[0-9]{1,2})?$`)

// parseDecimal2 reads a non-negative decimal with at most two decimals as hundredths,
// without going through a float: "12.35" → 1235, "7" → 700.
func parseDecimal2(s string) (int64, bool) {
	s = strings.TrimSpace(s)
	if !decimalRE.MatchString(s) {
		return 0, false
	}
	whole, frac, _ := strings.Cut(strings.ReplaceAll(s, "_", ""), ".")
	for len(frac) < 2 {
		frac += "0"
	}
	v, err := strconv.ParseInt(whole+frac, 10, 64)
	if err != nil || v > 1e15 {
		return 0, false
	}
	return v, true
}

// cents is a money amount in a price file, read exactly from its decimal text.
type cents int64

func (c *cents) UnmarshalYAML(n *yaml.Node) error {
	if n.Kind != yaml.ScalarNode || (n.Tag != "!!int" && n.Tag != "!!float" && n.Tag != "!!str") {
		return input.Errorf(ErrWrongType, "want an amount such as 12.35, got %s", input.KindName(n))
	}
	v, ok := parseDecimal2(n.Value)
	if !ok {
		return input.Errorf(ErrBadValue, "want an amount >= 0 with at most two decimals, such as 12.35, got %q", n.Value)
	}
	*c = cents(v)
	return nil
}

// basisPoints is a percentage in a price file, read exactly: 8.25 → 825.
type basisPoints int64

func (b *basisPoints) UnmarshalYAML(n *yaml.Node) error {
	if n.Kind != yaml.ScalarNode || (n.Tag != "!!int" && n.Tag != "!!float") {
		return input.Errorf(ErrWrongType, "want a percentage such as 8.25, got %s", input.KindName(n))
	}
	v, ok := parseDecimal2(n.Value)
	if !ok || v > 100_00 {
		return input.Errorf(ErrBadValue, "want a percentage from 0 to 100 with at most two decimals, got %q", n.Value)
	}
	*b = basisPoints(v)
	return nil
}

type priceFile struct {
	Pos                 pos                                 `yaml:"-"`
	Label               string                              `yaml:"label"`
	Currency            string                              `yaml:"currency"`
	PricesDate          string                              `yaml:"prices_date"`
	CablePerM           map[string]map[string]map[int]cents `yaml:"cable_per_m" keyrange:"count"`
	TerminationEach     map[string]cents                    `yaml:"termination_each"`
	SpliceTray          spliceTrayYAML                      `yaml:"splice_tray"`
	SpliceClosureEach   cents                               `yaml:"splice_closure_each"`
	TransitionEach      cents                               `yaml:"transition_splice_each"`
	FibreEnclosures     map[int]cents                       `yaml:"fibre_enclosures" keyrange:"count"`
	AdapterPanels       map[int]cents                       `yaml:"adapter_panels" keyrange:"count"`
	CopperPatchPanels   map[int]cents                       `yaml:"copper_patch_panels" keyrange:"count"`
	InnerductPerM       cents                               `yaml:"innerduct_per_m"`
	StructuresEach      map[string]cents                    `yaml:"structures_each"`
	TrenchPerM          map[string]cents                    `yaml:"trench_per_m"`
	DirectionalBorePerM cents                               `yaml:"directional_bore_per_m"`
	RestorationPerM     map[string]cents                    `yaml:"restoration_per_m"`
	AddedDuctPerM       cents                               `yaml:"added_duct_per_m"`
	NewPathwayPerM      map[string]cents                    `yaml:"new_pathway_per_m"`
	EntranceEach        cents                               `yaml:"building_entrance_each"`
	FirestopEach        cents                               `yaml:"entrance_firestop_each"`
	SplicePointEach     cents                               `yaml:"splice_point_each"`
	ProtectorEach       cents                               `yaml:"primary_protector_each"`
	HoleEntryEach       cents                               `yaml:"maintenance_hole_entry_each"`
	PoleRiserEach       cents                               `yaml:"pole_riser_each"`
	BondingEach         cents                               `yaml:"metallic_member_bonding_each"`
	CrewEach            map[string]cents                    `yaml:"crew_each"`
	Labour              labourYAML                          `yaml:"labour"`
	Transceivers        map[string]cents                    `yaml:"transceivers"`
	PatchCordsEach      map[string]cents                    `yaml:"patch_cords_each"`
	TerminationMethod   string                              `yaml:"termination_method"`
	AttenuatorsEach     map[int]cents                       `yaml:"attenuators_each" keyrange:"attenuator-db"`
	Markups             markupsYAML                         `yaml:"markups_percent"`
	TaxedCategories     []string                            `yaml:"taxed_categories"`
	BidItems            []bidItemYAML                       `yaml:"bid_items" item:"bid item"`
}

type bidItemYAML struct {
	Pos         pos           `yaml:"-"`
	ID          string        `yaml:"id"`
	Description string        `yaml:"description"`
	LumpSum     cents         `yaml:"lump_sum"`
	PerM        cents         `yaml:"per_m_new_buried"`
	PerAerialM  cents         `yaml:"per_m_aerial"`
	PerDuctM    cents         `yaml:"per_m_existing_duct_used"`
	PerStruct   cents         `yaml:"per_structure_passed"`
	PerBuilding cents         `yaml:"per_building_served"`
	PerEnd      cents         `yaml:"per_cable_end"`
	PerLeg      cents         `yaml:"per_leg"`
	PercentOf   percentOfYAML `yaml:"percent_of"`
}

type percentOfYAML struct {
	Pos        pos         `yaml:"-"`
	Percent    basisPoints `yaml:"percent"`
	Categories []string    `yaml:"categories"`
}

// Bases of a bid item, the keys of bid_items that price one (BidItem.Basis): a lump sum,
// a rate per unit of a quantity the estimate counts (BidBases), or a percentage of the
// subtotal of listed categories.
const (
	BasisLumpSum       = "lump_sum"
	BasisNewBuriedM    = "per_m_new_buried"         // metres of new trench and bore
	BasisAerialM       = "per_m_aerial"             // metres of aerial spans the routes use, each span once
	BasisExistingDuctM = "per_m_existing_duct_used" // metres of existing duct spans the routes use, each span once
	BasisStructure     = "per_structure_passed"     // structures the routes pass through, each once
	BasisBuilding      = "per_building_served"      // buildings that terminate cable
	BasisCableEnd      = "per_cable_end"            // cable ends: two per cable of every feasible leg
	BasisLeg           = "per_leg"                  // feasible legs
	BasisPercentOf     = "percent_of"
	MarkupContingency  = "contingency"
	MarkupOverhead     = "overhead"
	CategoryBidItems   = "bid items" // the category of bid item lines, listed after the others when the book has bid items
)

// PerUnitBases returns the bases priced per unit of a counted quantity, in a fixed order.
func PerUnitBases() []string {
	return []string{BasisNewBuriedM, BasisAerialM, BasisExistingDuctM, BasisStructure, BasisBuilding, BasisCableEnd, BasisLeg}
}

// BidItem is one item a bid carries: a lump sum (Cents), a rate in Cents per unit of a
// counted Basis, or PercentBP of the subtotal of the categories Of.
type BidItem struct {
	ID, Description string
	Basis           string // a Basis* constant
	Cents           int64
	PercentBP       int64
	Of              []string
}

type spliceTrayYAML struct {
	Pos     pos   `yaml:"-"`
	Each    cents `yaml:"each"`
	Strands int   `yaml:"strands" range:"count"`
}

type labourYAML struct {
	Pos                 pos                `yaml:"-"`
	HourlyRate          cents              `yaml:"hourly_rate"`
	PullMPerHour        map[string]float64 `yaml:"pull_m_per_hour" range:"per-hour"`
	SplicesPerHour      float64            `yaml:"splices_per_hour" range:"per-hour"`
	TerminationsPerHour float64            `yaml:"terminations_per_hour" range:"per-hour"`
	TestsPerHour        testsYAML          `yaml:"tests_per_hour"`
}

type testsYAML struct {
	Pos  pos     `yaml:"-"`
	Loss float64 `yaml:"loss" range:"per-hour"`
	OTDR float64 `yaml:"otdr" range:"per-hour"`
}

type markupsYAML struct {
	Pos         pos         `yaml:"-"`
	Contingency basisPoints `yaml:"contingency"`
	Overhead    basisPoints `yaml:"overhead"`
	Tax         basisPoints `yaml:"tax"`
}

// Ways a fibre strand end is terminated, the values of PriceBook.Termination and
// EngineOptions.Termination.
const (
	TerminationSplicedPigtail = "spliced-pigtail"   // a factory-polished pigtail fusion-spliced to the strand
	TerminationFieldConnector = "field-connector"   // a connector fitted and polished (or pre-polished) in the field
	TerminationFactory        = "factory-connector" // a pre-terminated cable, connectors fitted in the factory
)

// Terminations returns the termination methods in a fixed order.
func Terminations() []string {
	return []string{TerminationSplicedPigtail, TerminationFieldConnector, TerminationFactory}
}

// TerminationSplices is the number of splices one strand end of termination method t puts in
// the channel (a spliced pigtail 1, a connector 0), or -1 for an unknown method.
func TerminationSplices(t string) int {
	switch t {
	case TerminationSplicedPigtail:
		return 1
	case TerminationFieldConnector, TerminationFactory:
		return 0
	}
	return -1
}

// Names the price book accepts as map keys, besides media, constructions and applications.
var (
	surfaces       = []string{"turf", "asphalt", "concrete"}
	structureTypes = []string{"pull-box", "handhole", "maintenance-hole"}
	pathwayTypes   = []string{"duct", "tunnel", "aerial", "buried", "tray"}
	// BuiltPathwayTypes are the pathway types whose new construction is neither trench nor
	// bore, each priced per metre at new_pathway_per_m (PriceNewPathway): a pole line, a
	// cable tray, a utility tunnel.
	BuiltPathwayTypes = []string{"aerial", "tray", "tunnel"}
)

var currencyRE = regexp.MustCompile(`^[A-Z]{3}$`)

//go:embed prices-demo.yaml
var pricesYAML []byte

// DefaultPricesFile is the name the embedded demo price book goes by in messages.
const DefaultPricesFile = "prices-demo.yaml (embedded)"

// DefaultPriceBook returns the embedded demo price book, whose prices are invented. It
// panics if the embedded file is invalid, which the package tests rule out.
func DefaultPriceBook() *PriceBook {
	p, err := ParsePriceBook(DefaultPricesFile, pricesYAML)
	if err != nil {
		panic("media: embedded price book: " + err.Error())
	}
	return p
}

// LoadPriceBook reads and validates a price book file.
func LoadPriceBook(path string) (*PriceBook, error) {
	data, err := readFile(path)
	if err != nil {
		return nil, err
	}
	return ParsePriceBook(path, data)
}

// ParsePriceBook reads a price book from data; name is the file name used in messages.
// Unknown keys, bad amounts and bad names are all reported at once in an *input.Problems,
// each naming the key and its line. Amounts are decimal with at most two decimals and
// are read without a float (12.35 → 1235 cents).
func ParsePriceBook(name string, data []byte) (*PriceBook, error) {
	var errs input.Problems
	var f priceFile
	newDecoder(name, &errs).Parse(data, &f)
	if errs.Len() > 0 && f.Pos.Keys == nil {
		return nil, sorted(&errs)
	}
	c := checker{file: name, errs: &errs}
	c.require(f.Pos, "", "label", "currency", "prices_date")
	p := &PriceBook{File: name, Label: f.Label, Currency: f.Currency, PricesDate: f.PricesDate,
		SpliceTrayStrands: f.SpliceTray.Strands, Termination: TerminationSplicedPigtail,
		ContingencyBP: int64(f.Markups.Contingency), OverheadBP: int64(f.Markups.Overhead), TaxBP: int64(f.Markups.Tax),
		money: map[PriceKey]int64{}, rates: map[PriceKey]float64{}}
	if f.Pos.Has("label") && strings.TrimSpace(f.Label) == "" {
		c.bad(f.Pos, "", "label", ErrBadValue, "want a label saying whose prices these are, got an empty string")
	}
	if f.Pos.Has("currency") && !currencyRE.MatchString(f.Currency) {
		c.bad(f.Pos, "", "currency", ErrBadValue, "want an ISO 4217 code such as USD, got %q", f.Currency)
	}
	if f.Pos.Has("prices_date") {
		if _, err := time.Parse("2006-01-02", f.PricesDate); err != nil {
			c.bad(f.Pos, "", "prices_date", ErrBadValue, "want a date YYYY-MM-DD, got %q", f.PricesDate)
		}
	}
	money := func(k PriceKey, v cents) { p.money[k] = int64(v) }
	for _, m := range sortedStrings(f.CablePerM) {
		for _, k := range sortedStrings(f.CablePerM[m]) {
			for _, n := range sortedInts(f.CablePerM[m][k]) {
				if n <= 0 {
					c.badPath(f.Pos, "cable_per_m", []string{m, k, strconv.Itoa(n)}, "want a strand count > 0, got %d", n)
					continue
				}
				money(PriceKey{Item: PriceCable, Medium: m, Construction: k, Count: n}, f.CablePerM[m][k][n])
			}
		}
	}
	for _, m := range sortedStrings(f.TerminationEach) {
		money(PriceKey{Item: PriceTermination, Medium: m}, f.TerminationEach[m])
	}
	for _, m := range sortedStrings(f.PatchCordsEach) {
		money(PriceKey{Item: PricePatchCord, Medium: m}, f.PatchCordsEach[m])
	}
	if f.Pos.Has("splice_tray") {
		if c.require(f.SpliceTray.Pos, "", "each", "strands") {
			money(PriceKey{Item: PriceSpliceTray}, f.SpliceTray.Each)
			if f.SpliceTray.Strands <= 0 {
				c.bad(f.SpliceTray.Pos, "", "splice_tray.strands", ErrBadValue, "want splices per tray > 0, got %d", f.SpliceTray.Strands)
			}
		}
	}
	scalar := func(key, item string, v cents) {
		if f.Pos.Has(key) {
			money(PriceKey{Item: item}, v)
		}
	}
	scalar("splice_closure_each", PriceSpliceClosure, f.SpliceClosureEach)
	scalar("transition_splice_each", PriceTransition, f.TransitionEach)
	scalar("innerduct_per_m", PriceInnerduct, f.InnerductPerM)
	scalar("directional_bore_per_m", PriceBore, f.DirectionalBorePerM)
	scalar("added_duct_per_m", PriceAddedDuct, f.AddedDuctPerM)
	scalar("building_entrance_each", PriceEntrance, f.EntranceEach)
	scalar("entrance_firestop_each", PriceFirestop, f.FirestopEach)
	scalar("splice_point_each", PriceSplicePoint, f.SplicePointEach)
	scalar("primary_protector_each", PriceProtector, f.ProtectorEach)
	scalar("maintenance_hole_entry_each", PriceHoleWall, f.HoleEntryEach)
	scalar("pole_riser_each", PricePoleRiser, f.PoleRiserEach)
	scalar("metallic_member_bonding_each", PriceBonding, f.BondingEach)
	ports := func(key, item string, m map[int]cents) {
		for _, n := range sortedInts(m) {
			if n <= 0 {
				c.badPath(f.Pos, key, []string{strconv.Itoa(n)}, "want a port count > 0, got %d", n)
				continue
			}
			money(PriceKey{Item: item, Count: n}, m[n])
		}
	}
	if f.Pos.Has("termination_method") {
		if TerminationSplices(f.TerminationMethod) < 0 {
			c.bad(f.Pos, "", "termination_method", ErrBadValue, "want one of %s, got %q", strings.Join(Terminations(), ", "), f.TerminationMethod)
		} else {
			p.Termination = f.TerminationMethod
		}
	}
	for _, n := range sortedInts(f.AttenuatorsEach) {
		money(PriceKey{Item: PriceAttenuator, Count: n}, f.AttenuatorsEach[n])
	}
	ports("fibre_enclosures", PriceEnclosure, f.FibreEnclosures)
	ports("adapter_panels", PriceAdapterPanel, f.AdapterPanels)
	ports("copper_patch_panels", PriceCopperPanel, f.CopperPatchPanels)
	named := func(key, item string, m map[string]cents, allowed []string) {
		for _, n := range sortedStrings(m) {
			if allowed != nil && !contains(allowed, n) {
				c.badPath(f.Pos, key, []string{n}, "want one of %s, got %q", strings.Join(allowed, ", "), n)
				continue
			}
			money(PriceKey{Item: item, Name: n}, m[n])
		}
	}
	named("structures_each", PriceStructure, f.StructuresEach, structureTypes)
	named("trench_per_m", PriceTrench, f.TrenchPerM, surfaces)
	named("restoration_per_m", PriceRestoration, f.RestorationPerM, surfaces)
	named("new_pathway_per_m", PriceNewPathway, f.NewPathwayPerM, BuiltPathwayTypes)
	named("transceivers", PriceTransceiver, f.Transceivers, nil)
	named("crew_each", PriceCrew, f.CrewEach, CrewTasks)
	if f.Pos.Has("labour") {
		lb := f.Labour
		if lb.Pos.Has("hourly_rate") {
			money(PriceKey{Item: PriceLabourHour}, lb.HourlyRate)
		}
		rate := func(p0 pos, key, field string, item string, v float64) {
			if !p0.Has(key) {
				return
			}
			if v <= 0 {
				c.bad(p0, "", field, ErrBadValue, "want a number per hour > 0, got %g", v)
				return
			}
			p.rates[PriceKey{Item: item}] = v
		}
		rate(lb.Pos, "splices_per_hour", "labour.splices_per_hour", RateSplice, lb.SplicesPerHour)
		rate(lb.Pos, "terminations_per_hour", "labour.terminations_per_hour", RateTermination, lb.TerminationsPerHour)
		rate(lb.TestsPerHour.Pos, "loss", "labour.tests_per_hour.loss", RateLossTest, lb.TestsPerHour.Loss)
		rate(lb.TestsPerHour.Pos, "otdr", "labour.tests_per_hour.otdr", RateOTDRTest, lb.TestsPerHour.OTDR)
		for _, t := range sortedStrings(lb.PullMPerHour) {
			v := lb.PullMPerHour[t]
			switch {
			case !contains(pathwayTypes, t):
				c.badPath(lb.Pos, "labour.pull_m_per_hour", []string{t}, "want one of %s, got %q", strings.Join(pathwayTypes, ", "), t)
			case v <= 0:
				c.badPath(lb.Pos, "labour.pull_m_per_hour", []string{t}, "want metres per hour > 0, got %g", v)
			default:
				p.rates[PriceKey{Item: RatePull, Name: t}] = v
			}
		}
	}
	p.Taxed = append(Categories(), MarkupContingency, MarkupOverhead)
	if len(f.BidItems) > 0 {
		p.Taxed = append(Categories(), CategoryBidItems, MarkupContingency, MarkupOverhead)
	}
	if f.Pos.Has("taxed_categories") {
		p.Taxed = c.names(f.Pos, "", "taxed_categories", f.TaxedCategories, p.Taxed)
	}
	p.BidItems = c.bidItems(f.BidItems)
	for _, b := range p.BidItems {
		if b.Basis != BasisPercentOf {
			money(PriceKey{Item: PriceBidItem, Name: b.ID}, cents(b.Cents))
		}
	}
	if err := sorted(&errs); err != nil {
		return nil, err
	}
	return p, nil
}

// reportedItem reports whether a problem of item was reported already.
func (c checker) reportedItem(item string) bool {
	for _, p := range c.errs.List {
		if p.File == c.file && p.Item == item {
			return true
		}
	}
	return false
}

// names checks that every name of list is one of allowed and named once, at the key's line,
// and returns the list.
func (c checker) names(p pos, item, key string, list, allowed []string) []string {
	seen := map[string]bool{}
	for i, n := range list {
		field := fmt.Sprintf("%s[%d]", key, i)
		switch {
		case !contains(allowed, n):
			c.bad(p, item, field, ErrBadValue, "want one of %s, got %q", strings.Join(allowed, ", "), n)
		case seen[n]:
			c.bad(p, item, field, ErrBadValue, "%q is listed twice", n)
		}
		seen[n] = true
	}
	return append([]string{}, list...)
}

// bidItems checks the entries of bid_items: an id, a description, exactly one basis, and for
// percent_of a percentage and the categories it applies to.
func (c checker) bidItems(ys []bidItemYAML) []BidItem {
	var out []BidItem
	ids := map[string]bool{}
	for i, y := range ys {
		item := "bid item " + itemLabel(y.ID, i)
		if !c.require(y.Pos, item, "id", "description") {
			continue
		}
		if !idRE.MatchString(y.ID) {
			c.bad(y.Pos, item, "id", ErrBadValue, "want lower-case letters, digits and hyphens, got %q", y.ID)
			continue
		}
		if ids[y.ID] {
			c.bad(y.Pos, item, "id", ErrDuplicateID, "%q is used by an earlier bid item", y.ID)
			continue
		}
		ids[y.ID] = true
		if strings.TrimSpace(y.Description) == "" {
			c.bad(y.Pos, item, "description", ErrBadValue, "want words saying what the item is, got an empty string")
			continue
		}
		amounts := map[string]cents{BasisLumpSum: y.LumpSum, BasisNewBuriedM: y.PerM, BasisAerialM: y.PerAerialM,
			BasisExistingDuctM: y.PerDuctM, BasisStructure: y.PerStruct, BasisBuilding: y.PerBuilding, BasisCableEnd: y.PerEnd, BasisLeg: y.PerLeg}
		all := append([]string{BasisLumpSum}, PerUnitBases()...)
		all = append(all, BasisPercentOf)
		var given []string
		for _, k := range all {
			if y.Pos.Has(k) {
				given = append(given, k)
			}
		}
		switch {
		case len(given) > 1: // at the second basis given
			c.bad(y.Pos, item, given[1], ErrBadValue, "want exactly one of %s, got %d (%s)", strings.Join(all, ", "), len(given), strings.Join(given, ", "))
			continue
		case len(given) == 0:
			if !c.reportedItem(item) { // an unknown key, already reported, is usually the basis misspelt
				c.bad(y.Pos, item, "id", ErrBadValue, "want one of %s besides id and description, got none", strings.Join(all, ", "))
			}
			continue
		}
		b := BidItem{ID: y.ID, Description: y.Description, Basis: given[0], Cents: int64(amounts[given[0]])}
		if b.Basis == BasisPercentOf {
			po := y.PercentOf
			if !c.require(po.Pos, item, "percent", "categories") {
				continue
			}
			if len(po.Categories) == 0 {
				c.bad(po.Pos, item, "percent_of.categories", ErrBadValue, "want at least one category of %s", strings.Join(Categories(), ", "))
				continue
			}
			b.PercentBP, b.Of = int64(po.Percent), c.names(po.Pos, item, "percent_of.categories", po.Categories, Categories())
		}
		out = append(out, b)
	}
	return out
}

// badPath reports a bad entry of a nested map under key, at the entry's own line. key may
// be dotted ("labour.pull_m_per_hour"); its last part is looked up in p.
func (c checker) badPath(p pos, key string, path []string, format string, args ...any) {
	field := key + "." + strings.Join(path, ".")
	key = lastKey(key)
	line, col := p.At(key)
	if k, ok := p.Keys[key]; ok && k.Value != nil {
		n := input.Resolve(k.Value)
		for _, step := range path {
			found := false
			for i := 0; i+1 < len(n.Content); i += 2 {
				if n.Content[i].Value == step {
					line, col = n.Content[i].Line, n.Content[i].Column
					n = input.Resolve(n.Content[i+1])
					found = true
					break
				}
			}
			if !found {
				break
			}
		}
	}
	c.badAt(line, col, "", field, ErrBadValue, format, args...)
}

func sortedStrings[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// Needs returns the prices the rule engine needs for catalog c: every cable size of every
// construction, a termination per medium and a transceiver per application.
func Needs(c *Catalog) []PriceKey {
	var needs []PriceKey
	for _, m := range c.Media {
		needs = append(needs, PriceKey{Item: PriceTermination, Medium: m.ID})
		for _, k := range m.Constructions {
			for _, s := range k.Sizes {
				needs = append(needs, PriceKey{Item: PriceCable, Medium: m.ID, Construction: k.ID, Count: s.Count})
			}
		}
	}
	for _, a := range c.Applications {
		needs = append(needs, PriceKey{Item: PriceTransceiver, Name: a.Transceiver})
	}
	return needs
}
