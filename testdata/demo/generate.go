//go:build ignore

// Command generate writes testdata/demo/campus.geojson, the invented demo campus of Ostrey
// Polytechnic at Fallowmere Vale. Run it from the module root:
//
//	go run testdata/demo/generate.go
//
// The campus is laid out on a local grid in metres (x east, y north) and converted to WGS84
// longitude/latitude with a flat-earth approximation about an origin in open countryside; the
// layout is invented and describes no real site. Output is deterministic: features are written
// in a fixed order, coordinates with 7 decimals, and the only random draws (spare duct counts
// of the street ducts) come from a generator with a fixed seed.
package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
)

// Origin of the local grid, in degrees. Open upland; nothing real is modelled here.
const (
	lat0 = 52.3520
	lon0 = -3.7300
)

const outFile = "testdata/demo/campus.geojson"

type pt struct{ x, y float64 }

// lonLat converts a local grid point in metres to [lon, lat] in degrees.
func lonLat(p pt) (lon, lat float64) {
	lon = lon0 + p.x/(111320*math.Cos(lat0*math.Pi/180))
	lat = lat0 + p.y/110540
	return lon, lat
}

func coord(p pt) string {
	lon, lat := lonLat(p)
	return "[" + strconv.FormatFloat(lon, 'f', 7, 64) + "," + strconv.FormatFloat(lat, 'f', 7, 64) + "]"
}

// kv is one property; properties keep the order they are given in.
type kv struct {
	k string
	v any // string, int, bool or float64
}

type feature struct {
	geomType string
	coords   string
	props    []kv
}

var features []feature

func line(pts []pt) string {
	var b bytes.Buffer
	b.WriteByte('[')
	for i, p := range pts {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(coord(p))
	}
	b.WriteByte(']')
	return b.String()
}

// ring closes pts and orders them counter-clockwise, as RFC 7946 asks of exterior rings.
func ring(pts []pt) string {
	area := 0.0
	for i := range pts {
		j := (i + 1) % len(pts)
		area += pts[i].x*pts[j].y - pts[j].x*pts[i].y
	}
	r := append([]pt(nil), pts...)
	if area < 0 {
		for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
			r[i], r[j] = r[j], r[i]
		}
	}
	r = append(r, r[0])
	return "[" + line(r) + "]"
}

func rect(x0, y0, x1, y1 float64) []pt {
	return []pt{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}}
}

// building adds a footprint; extra holds role and riser_m when set.
func building(id, name string, outline []pt, extra ...kv) {
	props := []kv{{"kind", "building"}, {"id", id}, {"name", name}}
	props = append(props, extra...)
	features = append(features, feature{"Polygon", ring(outline), props})
}

func pathway(id string, props []kv, pts ...pt) {
	all := []kv{{"kind", "pathway"}, {"id", id}}
	all = append(all, props...)
	features = append(features, feature{"LineString", line(pts), all})
}

func structure(id, typ string, p pt) {
	features = append(features, feature{"Point", coord(p), []kv{{"kind", "structure"}, {"id", id}, {"type", typ}}})
}

func entrance(id, bldg string, p pt) {
	props := []kv{{"kind", "entrance"}}
	if id != "" {
		props = append(props, kv{"id", id})
	}
	props = append(props, kv{"building", bldg})
	features = append(features, feature{"Point", coord(p), props})
}

// rng draws the spare duct counts of street ducts; the seed is fixed so output never changes.
var rng = rand.New(rand.NewPCG(20240611, 7))

// street is an existing street duct with a drawn spare duct count of 1 to 4.
func street(id string, extra []kv, pts ...pt) {
	props := []kv{{"type", "duct"}, {"spare_ducts", 1 + rng.IntN(4)}}
	pathway(id, append(props, extra...), pts...)
}

// stub is an existing building service duct.
func stub(id string, spare int, extra []kv, pts ...pt) {
	props := []kv{{"type", "duct"}, {"spare_ducts", spare}}
	pathway(id, append(props, extra...), pts...)
}

func proposed(id, typ, surface string, pts ...pt) {
	pathway(id, []kv{{"type", typ}, {"status", "proposed"}, {"surface", surface}}, pts...)
}

var (
	mm50    = kv{"duct_mm", 50}
	emiHigh = kv{"emi", "high"}
	emiLow  = kv{"emi", "low"}
)

func group(g string) kv { return kv{"group", g} }

// Telecom points: where service ducts meeting an indoor pathway (tunnel or tray) end, in the
// basement inside the footprint; the tunnels and the tray are the pathway indoors there.
var (
	tADM = pt{60, 0}
	tSCI = pt{60, -150}
	tCEP = pt{60, -290}
	tENG = pt{-310, -20}
	tWKS = pt{-255, -20}
)

// Wall points: where a service duct, drop or proposed duct meets a building's wall. Every
// other pathway into a building ends on its wall, one wall point per pathway, so the building
// entrance is where the duct comes through the wall and the riser (riser_m) takes the cable on
// to the telecom room. Declared entrances sit on the wall point of their pathway.
var (
	wANXw  = pt{95, 0}      // Registry Annex, west wall (S-ANX from Ostrey Hall)
	wLIBs  = pt{60, 130}    // Library, south wall: the tunnel T-2 comes in here (E-LIB)
	wLIBn  = pt{60, 200}    // Library, north wall (S-LIB from North Road)
	wMEDw  = pt{-150, 170}  // Health Centre, west wall (S-MED-W, E-MED)
	wMEDn  = pt{-120, 200}  // Health Centre, north wall (S-MED-N)
	wMEDe  = pt{-80, 150}   // Health Centre, east wall (P-9)
	wHUMe  = pt{-20, 135}   // Humanities, east wall (S-HUM)
	wHUMw  = pt{-60, 150}   // Humanities, west wall (P-9)
	wCAFe  = pt{165, 130}   // Refectory, east wall (S-CAF)
	wMTHw  = pt{210, 180}   // Mathematics, west wall (S-MTH)
	wCSCn  = pt{320, 160}   // Computing, north wall (S-CSC)
	wTWRw  = pt{220, 0}     // Halvard Tower, west wall (S-TWR-W, E-TWR)
	wTWRe  = pt{270, 0}     // Halvard Tower, east wall (S-TWR-E)
	wTWRse = pt{270, -25}   // Halvard Tower, east wall by the forecourt (S-RSB-T)
	wRSBw  = pt{295, -25}   // Kestrel Court South, west wall (S-RSB-T)
	wRSBs  = pt{320, -65}   // Kestrel Court South, south wall (S-RSB)
	wARTw  = pt{-340, 160}  // School of Art, west wall (S-ART)
	wCHMw  = pt{-340, -170} // Chemistry, west wall (S-CHM)
	wCHMe  = pt{-280, -175} // Chemistry, east wall (P-8)
	wPHYs  = pt{-225, -220} // Physics, south wall (S-PHY)
	wPHYw  = pt{-250, -175} // Physics, west wall (P-8)
	wBUSw  = pt{-160, -150} // School of Business, west wall (S-BUS)
	wESTw  = pt{210, -180}  // Estates Depot, west wall (S-EST)
	wESTe  = pt{270, -170}  // Estates Depot, east wall (S-STO)
	wSTOw  = pt{290, -170}  // Central Stores, west wall (S-STO)
	wSTOe  = pt{340, -170}  // Central Stores, east wall (P-5)
	wGYMs  = pt{430, 120}   // Sports Hall, south wall (S-GYM)
	wGYMn  = pt{430, 180}   // Sports Hall, north wall (P-7)
	wAQUn  = pt{430, 70}    // Aquatics Centre, north wall (S-AQU)
	wLDGn  = pt{-445, 20}   // West Gate Lodge, north wall (S-LDG)
	wLDGe  = pt{-430, -5}   // West Gate Lodge, east wall (P-4)
	wFRMs  = pt{775, 790}   // Home Farm Office, south wall (B-FRM)
	wBRNw  = pt{830, 765}   // Livestock Barn, west wall
	wSHDs  = pt{740, 785}   // Implement Shed, south wall (B-SHD)
	wOBSs  = pt{740, 930}   // Observatory, south wall (B-OBS, its entrance)
)

// Network points that several features share.
var (
	pb1 = pt{400, 280} // pull box where the pole line leaves the duct network
	fj  = pt{760, 770} // farm junction handhole
)

func buildings() {
	mc := kv{"role", "mc"}
	ic := kv{"role", "ic"}
	building("ADM", "Ostrey Hall (Administration)", rect(20, -30, 80, 30), mc, kv{"transit", true}) // its basement plant room carries ducts through
	building("ANX", "Registry Annex", rect(95, -25, 145, 25))
	building("LIB", "Fallowmere Library", rect(40, 130, 110, 200), kv{"riser_m", 25})
	building("SCI", "Corran Science Centre", []pt{{40, -200}, {120, -200}, {120, -160}, {80, -160}, {80, -120}, {40, -120}}, kv{"riser_m", 20})
	building("CEP", "Central Energy Plant", rect(40, -330, 110, -280))
	building("MED", "Wendle Health Centre", rect(-150, 140, -80, 200))
	building("HUM", "Humanities Building", rect(-60, 100, -20, 170))
	building("ENG", "Tarrow Engineering Hall", rect(-345, -60, -275, 10), ic)
	building("WKS", "Engineering Workshops", rect(-260, -50, -210, 0))
	building("TWR", "Halvard Tower", rect(220, -30, 270, 30), ic, kv{"riser_m", 45})
	building("RSA", "Kestrel Court North", rect(295, 20, 345, 65))
	building("RSB", "Kestrel Court South", rect(295, -65, 345, -20))
	building("ART", "Pennick School of Art", rect(-340, 130, -280, 190))
	building("MUS", "Music Rooms", rect(-260, 100, -200, 150))
	building("CAF", "Refectory", rect(125, 100, 165, 160))
	building("GYM", "Sports Hall", rect(400, 120, 480, 180))
	building("AQU", "Aquatics Centre", rect(400, 20, 455, 70))
	building("MTH", "Mathematics Building", rect(210, 150, 270, 210))
	building("CSC", "Computing Building", rect(290, 100, 345, 160))
	building("CHM", "Chemistry Laboratories", rect(-340, -200, -280, -140))
	building("PHY", "Physics Building", rect(-250, -220, -200, -150))
	building("BUS", "School of Business", []pt{{-160, -200}, {-120, -200}, {-120, -160}, {-90, -160}, {-90, -120}, {-160, -120}})
	building("LEC", "Assembly Theatres", rect(-70, -215, -20, -165))
	building("EST", "Estates Depot", rect(210, -210, 270, -150))
	building("STO", "Central Stores", rect(290, -200, 340, -140))
	building("LDG", "West Gate Lodge", rect(-460, -20, -430, 20), kv{"riser_m", 5})
	building("FRM", "Home Farm Office", rect(770, 790, 820, 830))
	building("BRN", "Livestock Barn", rect(830, 740, 910, 790))
	building("SHD", "Implement Shed", rect(715, 785, 745, 815), kv{"riser_m", 5})
	building("OBS", "Hillcrest Observatory", rect(725, 930, 755, 960), kv{"riser_m", 8})
}

// streets lays the street duct grid: columns at x = -360, -180, 0, 180, 360 and rows at
// y = -240 (South Road), -80 (Mill Lane), 80 (College Walk), 240 (North Road). The Commons,
// a lawn between x = -180 and 0 and y = -80 and 80, has no street through it. Where a
// building is reached by a lateral, the street duct kinks 3 m towards it at a vertex, so that
// vertex is the nearest point of any pathway to the footprint.
func streets() {
	// Westgate Avenue, x = -360.
	street("WA-1", nil, pt{-360, -240}, pt{-360, -170}, pt{-360, -80})
	street("WA-2", nil, pt{-360, -80}, pt{-360, -20}, pt{-360, 80})
	street("WA-3", nil, pt{-360, 80}, pt{-360, 160}, pt{-360, 240})
	// Rook Lane, x = -180.
	street("RL-1", nil, pt{-180, -240}, pt{-180, -150}, pt{-180, -80})
	street("RL-2", nil, pt{-180, -80}, pt{-180, 0}, pt{-180, 80})
	street("RL-3", nil, pt{-180, 80}, pt{-180, 170}, pt{-180, 240})
	// Quad Street, x = 0.
	street("QS-1", nil, pt{0, -240}, pt{-3, -190}, pt{0, -150}, pt{0, -80})
	street("QS-2", nil, pt{0, -80}, pt{0, 0}, pt{0, 80})
	street("QS-3", nil, pt{0, 80}, pt{0, 135}, pt{0, 240})
	// Foundry Road, x = 180; its south part carries the energy plant's feeder.
	street("FR-1", []kv{emiHigh}, pt{180, -240}, pt{180, -180}, pt{180, -80})
	street("FR-2", nil, pt{180, -80}, pt{180, 0}, pt{180, 80})
	street("FR-3", nil, pt{180, 80}, pt{180, 130}, pt{180, 180}, pt{180, 240})
	// Eastgate Avenue, x = 360.
	street("EA-1", nil, pt{360, -240}, pt{360, -170}, pt{360, -80})
	street("EA-2", nil, pt{360, -80}, pt{360, 0}, pt{357, 45}, pt{360, 80})
	street("EA-3", nil, pt{360, 80}, pt{360, 100}, pt{360, 240})
	// South Road, y = -240. SR-3 has no vertex where the energy tunnel passes beneath it.
	street("SR-1", nil, pt{-360, -240}, pt{-225, -240}, pt{-180, -240})
	street("SR-2", nil, pt{-180, -240}, pt{-90, -240}, pt{0, -240})
	street("SR-3", nil, pt{0, -240}, pt{150, -240})
	street("SR-4", []kv{emiHigh}, pt{150, -240}, pt{180, -240})
	street("SR-5", nil, pt{180, -240}, pt{270, -240}, pt{360, -240})
	// Mill Lane, y = -80 (no duct along the south edge of the Commons).
	street("ML-1", nil, pt{-360, -80}, pt{-180, -80})
	street("ML-2", nil, pt{0, -80}, pt{60, -80}, pt{180, -80})
	street("ML-3", nil, pt{180, -80}, pt{320, -80}, pt{360, -80})
	// College Walk, y = 80; CW-3 and CW-3B are one duct bank, the second 1.5 m south.
	street("CW-1", nil, pt{-360, 80}, pt{-310, 80}, pt{-230, 83}, pt{-180, 80})
	street("CW-2", nil, pt{0, 80}, pt{60, 80})
	pathway("CW-3", []kv{{"type", "duct"}, {"spare_ducts", 2}, group("BANK-CW")}, pt{60, 80}, pt{180, 80})
	pathway("CW-3B", []kv{{"type", "duct"}, {"spare_ducts", 4}, emiLow, group("BANK-CW")},
		pt{60, 80}, pt{70, 78.5}, pt{170, 78.5}, pt{180, 80})
	street("CW-4", nil, pt{180, 80}, pt{360, 80})
	// North Road, y = 240; NR-2, NR-3 and NR-3B are one duct bank, NR-3B 1.5 m north of NR-3.
	street("NR-1", nil, pt{-360, 240}, pt{-180, 240})
	pathway("NR-2", []kv{{"type", "duct"}, {"spare_ducts", 2}, group("BANK-NR")}, pt{-180, 240}, pt{-120, 240})
	pathway("NR-3", []kv{{"type", "duct"}, {"spare_ducts", 1}, group("BANK-NR")}, pt{-120, 240}, pt{0, 240})
	pathway("NR-3B", []kv{{"type", "duct"}, {"spare_ducts", 3}, mm50, group("BANK-NR")},
		pt{-120, 240}, pt{-110, 241.5}, pt{-10, 241.5}, pt{0, 240})
	street("NR-4", nil, pt{0, 240}, pt{60, 240}, pt{180, 240})
	street("NR-5", nil, pt{180, 240}, pt{320, 240}, pt{360, 240})
}

// services lays the building service ducts, the tray and the spurs.
func services() {
	stub("S-ADM", 3, nil, pt{0, 0}, tADM)
	stub("S-ANX", 2, []kv{mm50}, tADM, wANXw)
	stub("S-LIB", 2, nil, pt{60, 240}, wLIBn)
	stub("S-MED-W", 1, nil, pt{-180, 170}, wMEDw)
	stub("S-MED-N", 2, nil, pt{-120, 240}, wMEDn)
	stub("S-HUM", 1, nil, pt{0, 135}, wHUMe)
	stub("S-CAF", 1, []kv{mm50}, pt{180, 130}, wCAFe)
	stub("S-MTH", 1, nil, pt{180, 180}, wMTHw)
	stub("S-CSC", 2, nil, pt{320, 240}, wCSCn)
	stub("S-ENG-W", 2, nil, pt{-360, -20}, tENG)
	stub("S-ENG-N", 1, nil, pt{-310, 80}, tENG)
	pathway("TR-ENG", []kv{{"type", "tray"}}, tENG, tWKS) // tray along the covered walkway
	stub("S-TWR-W", 2, nil, pt{180, 0}, wTWRw)
	stub("S-TWR-E", 1, nil, pt{360, 0}, wTWRe)
	stub("S-RSB", 1, []kv{mm50}, pt{320, -80}, wRSBs)
	stub("S-RSB-T", 2, nil, wTWRse, wRSBw) // tower to its neighbour, under the forecourt
	stub("S-ART", 1, nil, pt{-360, 160}, wARTw)
	stub("S-CHM", 1, nil, pt{-360, -170}, wCHMw)
	stub("S-PHY", 1, nil, pt{-225, -240}, wPHYs)
	stub("S-BUS", 1, nil, pt{-180, -150}, wBUSw)
	stub("S-SCI", 2, nil, pt{0, -150}, tSCI)
	stub("S-EST", 1, nil, pt{180, -180}, wESTw)
	stub("S-STO", 1, []kv{mm50}, wESTe, wSTOw)                          // across the depot yard
	stub("S-CEP", 1, []kv{emiHigh}, tCEP, pt{150, -290}, pt{150, -240}) // beside the plant's feeder
	stub("S-LDG", 1, []kv{mm50}, pt{-360, 240}, pt{-445, 240}, wLDGn)
	stub("S-SPT", 2, nil, pt{360, 100}, pt{430, 100})
	stub("S-GYM", 1, []kv{emiLow}, pt{430, 100}, wGYMs) // past the floodlight contactors
	stub("S-AQU", 1, nil, pt{430, 100}, wAQUn)
	stub("S-NE", 2, nil, pt{360, 240}, pb1)
}

// tunnels lays the utility tunnel spine: energy plant – science – administration – library.
// T-5 passes under South Road with no vault, the one crossing without a junction.
func tunnels() {
	tun := []kv{{"type", "tunnel"}}
	pathway("T-1", tun, tADM, pt{60, 80})
	pathway("T-2", tun, pt{60, 80}, wLIBs)
	pathway("T-3", tun, tADM, pt{60, -80})
	pathway("T-4", tun, pt{60, -80}, tSCI)
	pathway("T-5", tun, tCEP, tSCI)
}

// farm lays the pole line along Brackle Lane to the farm and the observatory.
func farm() {
	aerial := []kv{{"type", "aerial"}}
	pathway("A-1", aerial, pb1, pt{460, 290}, pt{520, 300}, pt{580, 310}, pt{640, 320}, pt{700, 330})
	pathway("A-2", append(aerial, emiLow), pt{700, 330}, pt{760, 340}, pt{790, 360}, pt{800, 430}, pt{805, 500}) // shares poles with low-voltage distribution
	pathway("A-3", aerial, pt{805, 500}, pt{805, 570}, pt{800, 640}, pt{790, 710}, fj)
	pathway("A-4", aerial, fj, wBRNw)
	pathway("A-5", aerial, fj, pt{750, 850}, pt{745, 905})
	pathway("B-FRM", []kv{{"type", "buried"}}, fj, wFRMs)
	pathway("B-SHD", []kv{{"type", "buried"}}, fj, wSHDs)
	pathway("B-OBS", []kv{{"type", "buried"}}, pt{745, 905}, wOBSs)
}

// proposals lays the candidate new construction.
func proposals() {
	proposed("P-1", "buried", "turf", pt{-180, 0}, pt{0, 0})               // across the Commons
	proposed("P-2", "duct", "asphalt", pt{-180, -80}, pt{0, -80})          // under the Commons footpath
	proposed("P-3", "buried", "turf", pb1, fj)                             // across the fields to the farm
	proposed("P-4", "buried", "turf", pt{-360, -20}, wLDGe)                // short cut to the lodge
	proposed("P-5", "duct", "asphalt", wSTOe, pt{360, -170})               // stores yard to Eastgate Avenue
	proposed("P-6", "duct", "asphalt", pt{180, -180}, pt{100, -180}, tSCI) // service yard into science
	proposed("P-7", "buried", "turf", pt{360, 240}, wGYMn)                 // second feed to the sports hall
	proposed("P-8", "duct", "concrete", wCHMe, wPHYw)                      // chemistry to physics
	proposed("P-9", "duct", "concrete", wMEDe, wHUMw)                      // health centre to humanities
}

func structures() {
	mh := "maintenance-hole"
	structure("MH-01", mh, pt{-360, -80})
	structure("MH-02", mh, pt{-360, 80})
	structure("MH-03", mh, pt{-180, -240})
	structure("MH-04", mh, pt{-180, -80})
	structure("MH-05", mh, pt{-180, 80})
	structure("MH-06", mh, pt{-180, 240})
	structure("MH-07", mh, pt{0, -240})
	structure("MH-08", mh, pt{0, -80})
	structure("MH-09", mh, pt{0, 80})
	structure("MH-10", mh, pt{0, 240})
	structure("MH-11", mh, pt{180, -80})
	structure("MH-12", mh, pt{180, 80})
	structure("MH-13", mh, pt{180, 240})
	structure("MH-14", mh, pt{360, -80})
	structure("MH-15", mh, pt{360, 80})
	structure("MH-16", mh, pt{360, 240})
	structure("MH-17", mh, pt{60, 80})  // tunnel vault under College Walk
	structure("MH-18", mh, pt{60, -80}) // tunnel vault under Mill Lane
	structure("MH-19", mh, pt{180, -240})
	structure("MH-20", mh, pt{-360, -240})
	structure("MH-21", mh, pt{-360, 240})
	structure("MH-22", mh, pt{360, -240})
	hh := "handhole"
	structure("HH-01", hh, pt{0, 0})
	structure("HH-02", hh, pt{-180, 0})
	structure("HH-03", hh, pt{360, 100})
	structure("HH-04", hh, pt{430, 100})
	structure("HH-05", hh, fj)
	structure("HH-06", hh, pt{0, -150})
	structure("HH-07", hh, pt{-90, -240})
	structure("HH-08", hh, pt{-120, 240})
	structure("PB-01", "pull-box", pb1)
	// Handholes at 16 of the 18 tees of service ducts on street ducts; FR-3/S-MTH and NR-5/S-CSC
	// are left without, so the demo shows turn handholes added.
	for i, p := range []pt{
		{-360, -170}, {-360, -20}, {-360, 160}, {-310, 80}, {-225, -240}, {-180, -150}, {-180, 170}, {0, 135},
		{60, 240}, {150, -240}, {180, -180}, {180, 0}, {180, 130}, {320, -80}, {360, -170}, {360, 0},
	} {
		structure(fmt.Sprintf("HH-%02d", 9+i), hh, p)
	}
}

func entrances() {
	entrance("E-LIB", "LIB", wLIBs)
	entrance("E-MED", "MED", wMEDw)
	entrance("E-TWR", "TWR", wTWRw)
	entrance("", "OBS", wOBSs)
}

func propValue(v any) string {
	switch t := v.(type) {
	case string:
		b, err := json.Marshal(t)
		if err != nil {
			panic(err)
		}
		return string(b)
	case int:
		return strconv.Itoa(t)
	case bool:
		return strconv.FormatBool(t)
	case float64:
		return strconv.FormatFloat(t, 'f', -1, 64)
	}
	panic(fmt.Sprintf("generate: property value of type %T", v))
}

func write() []byte {
	var b bytes.Buffer
	b.WriteString("{\"type\":\"FeatureCollection\",\"features\":[\n")
	for i, f := range features {
		b.WriteString("{\"type\":\"Feature\",\"properties\":{")
		for j, p := range f.props {
			if j > 0 {
				b.WriteByte(',')
			}
			fmt.Fprintf(&b, "%q:%s", p.k, propValue(p.v))
		}
		fmt.Fprintf(&b, "},\"geometry\":{\"type\":%q,\"coordinates\":%s}}", f.geomType, f.coords)
		if i < len(features)-1 {
			b.WriteByte(',')
		}
		b.WriteByte('\n')
	}
	b.WriteString("]}\n")
	return b.Bytes()
}

func main() {
	buildings()
	streets()
	services()
	tunnels()
	farm()
	proposals()
	structures()
	entrances()
	if err := os.MkdirAll(filepath.Dir(outFile), 0o755); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	if err := os.WriteFile(outFile, write(), 0o644); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	fmt.Printf("wrote %s: %d features\n", outFile, len(features))
}
