package geo

import (
	"cmp"
	"fmt"
	"strings"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// Feature kinds, the values of the "kind" property.
const (
	KindBuilding  = "building"
	KindPathway   = "pathway"
	KindStructure = "structure"
	KindEntrance  = "entrance"
)

// Building roles, the values of a building's "role" property.
const (
	RoleMC = "mc" // main cross-connect
	RoleIC = "ic" // intermediate cross-connect
)

// Pathway types, statuses and EMI levels.
const (
	TypeDuct   = "duct"
	TypeTunnel = "tunnel"
	TypeAerial = "aerial"
	TypeBuried = "buried"
	TypeTray   = "tray"

	StatusExisting = "existing"
	StatusProposed = "proposed"

	EMINone = "none"
	EMILow  = "low"
	EMIHigh = "high"
)

// Property keys read from the input; keys that carry a quantity carry its unit.
const (
	PropKind       = "kind"
	PropID         = "id"
	PropName       = "name"
	PropRole       = "role"
	PropRiserM     = "riser_m"
	PropType       = "type"
	PropStatus     = "status"
	PropSpareDucts = "spare_ducts"
	PropDuctMM     = "duct_mm"
	PropEMI        = "emi"
	PropSurface    = "surface"
	PropMethod     = "method"
	PropPlenum     = "plenum"
	PropGroup      = "group"
	PropBuilding   = "building"
	PropTransit    = "transit"
)

// DefaultRiserM is the riser length from a building's entrance to its telecom room, in metres,
// used when a building has no riser_m.
const DefaultRiserM = 15.0

// Source locates a feature in the input: the file name (for a database, its connection
// string without the password) and either the 0-based index of the feature in that file's
// FeatureCollection or, for a feature read from a table (a GeoPackage's, a database's), the
// table and the row's feature id.
type Source struct {
	File  string
	Index int    // in a GeoJSON file's features
	Table string // "" for a GeoJSON feature
	FID   int64  // the row's feature id (its integer primary key) in Table
}

// Feature names the feature of id ("" for none) at s, for a problem.
func (s Source) Feature(id string) *input.Feature {
	return &input.Feature{Index: s.Index, ID: id, Table: s.Table, FID: s.FID}
}

// String names the place for a message that points at another feature: `campus.geojson
// feature #3` or `campus.gpkg table pathways fid 12`.
func (s Source) String() string {
	if s.Table != "" {
		return fmt.Sprintf("%s table %s fid %d", s.File, input.TableName(s.Table), s.FID)
	}
	return fmt.Sprintf("%s feature #%d", s.File, s.Index)
}

// Short names the feature of id within its file, for a warning: `#47 (SR-3)` or
// `table campus fid 48 (SR-3)`.
func (s Source) Short(id string) string {
	at := fmt.Sprintf("#%d", s.Index)
	if s.Table != "" {
		at = fmt.Sprintf("table %s fid %d", input.TableName(s.Table), s.FID)
	}
	if id != "" {
		at += " (" + id + ")"
	}
	return at
}

// compare orders sources: by file, then index or table and feature id.
func (s Source) compare(t Source) int {
	return cmp.Or(strings.Compare(s.File, t.File), cmp.Compare(s.Index, t.Index),
		strings.Compare(s.Table, t.Table), cmp.Compare(s.FID, t.FID))
}

// Building is a footprint polygon that may host a cross-connect.
type Building struct {
	Source
	ID     string
	Name   string
	Role   string // RoleMC, RoleIC or "" for a served building
	RiserM float64
	// Transit allows routes to pass through the building, in at one entrance and out at
	// another, as a pathway drawn inside it does (the "transit" property).
	Transit   bool
	Footprint orb.MultiPolygon
}

// Pathway is one input line along which cable can be placed.
type Pathway struct {
	Source
	ID         string
	Type       string // TypeDuct …
	Status     string // StatusExisting or StatusProposed
	SpareDucts int
	DuctMM     float64
	EMI        string // EMINone, EMILow, EMIHigh
	Surface    string // turf, asphalt, concrete or "": the ground where new trench is dug along it (plan.Design.AssumedSurface when "")
	Method     string // MethodTrench or MethodBore: how new work along it is built; MethodNone: none may be
	MethodSet  bool   // the campus gives the method; otherwise a plan may choose the cheaper
	Plenum     bool   // a tray in a plenum (an air-handling space): cable there must be plenum rated
	Group      string // shared-risk group; the pathway's own ID when absent
	Lines      orb.MultiLineString
}

// Structure is a maintenance hole, handhole or pull box.
type Structure struct {
	Source
	ID    string
	Type  string // maintenance-hole, handhole, pull-box
	Point orb.Point
}

// Entrance is a building's declared point of entry for backbone cable.
type Entrance struct {
	Source
	ID       string // may be ""
	Building string
	Point    orb.Point
}

// Campus is everything read from one or more GeoJSON files, GeoPackages or databases, in an order that does not depend
// on the order of the features or files: buildings, pathways and structures by id, entrances
// by building and point.
type Campus struct {
	Files      []string // the files read, which outputs must never overwrite (not a database)
	Buildings  []Building
	Pathways   []Pathway
	Structures []Structure
	Entrances  []Entrance

	// warns are the findings of the reading that stop nothing (a feature's id member that
	// differs from its id property, two footprints that overlap); Build gives them among
	// the Network's Warnings.
	warns []warnRec
	// slips are those of warns on a value the plan is made with that the campus likely did
	// not mean (unitSlipWarnings, nearFindings): Warning.Slip.
	slips []warnRec
}
