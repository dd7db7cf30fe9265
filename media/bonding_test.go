package media

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestMetallicMembers: whether a fibre construction has metallic members comes from its NFPA
// 70 Article 770 listing where it has one (OFC… conductive, OFN… nonconductive: NFPA 70
// Article 770, listings, seen), which metallic_members may repeat but not contradict; an
// unlisted construction, or one with a listing Article 770 does not define, must say; copper
// may not (its conductors take the primary protector, NFPA 70 800.90, seen).
func TestMetallicMembers(t *testing.T) {
	t.Parallel()
	good, err := os.ReadFile(filepath.Join("testdata", "good_small.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	const listing = "        listing: OFNR\n"
	for _, tc := range []struct {
		name, with string
		metallic   bool
		want       string // a problem's words; "" when the catalog loads
	}{
		{name: "OFNR", with: listing, metallic: false},                                            // NFPA 70 Article 770: N, nonconductive (seen)
		{name: "OFNR said", with: listing + "        metallic_members: false\n", metallic: false}, // the key may repeat the listing
		{name: "OFCR", with: "        listing: OFCR\n", metallic: true},                           // NFPA 70 Article 770: C, conductive (seen)
		{name: "OFCP said", with: "        listing: OFCP\n        metallic_members: true\n", metallic: true},
		{name: "OFNP-LS", with: "        listing: OFNP-LS\n", metallic: false}, // a suffix after the Article 770 type
		{name: "unlisted armoured", with: "        listing: \"\"\n        metallic_members: true\n", metallic: true},
		{name: "unlisted dielectric", with: "        metallic_members: false\n", metallic: false},
		{name: "OFNR said metallic", with: listing + "        metallic_members: true\n",
			want: `metallic_members: listing OFNR is nonconductive (no metallic members) under NFPA 70 Article 770; want metallic_members: false, or no key`},
		{name: "OFCR said dielectric", with: "        listing: OFCR\n        metallic_members: false\n",
			want: `listing OFCR is conductive (it has metallic members) under NFPA 70 Article 770; want metallic_members: true, or no key`},
		{name: "unlisted, unsaid", with: "        listing: \"\"\n",
			want: `metallic_members: missing: it has no NFPA 70 Article 770 listing, so say whether the cable has metallic members`},
		{name: "other listing, unsaid", with: "        listing: B2ca\n",
			want: `its listing "B2ca" is not one of Article 770's (OFN…, OFC…)`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			data := strings.Replace(string(good), listing, tc.with, 1)
			c, err := ParseCatalog("x.yaml", []byte(data))
			if tc.want != "" {
				if err == nil || !strings.Contains(err.Error(), tc.want) {
					t.Fatalf("got %v, want a problem containing %q", err, tc.want)
				}
				if !strings.Contains(err.Error(), `construction "riser"`) && !strings.Contains(err.Error(), "constructions[0]") {
					t.Errorf("the problem does not name the construction: %v", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if got := c.Medium("om4").Construction("riser").MetallicMembers; got != tc.metallic {
				t.Errorf("MetallicMembers %v, want %v", got, tc.metallic)
			}
		})
	}
	copper := strings.Replace(strings.Replace(string(good), "kind: multimode", "kind: copper", 1), "    attenuation_db_per_km: {850: 3.5, 1300: 1.5}\n", "", 1)
	copper = strings.Replace(copper, listing, "        listing: CMR\n        metallic_members: true\n", 1)
	if _, err := ParseCatalog("x.yaml", []byte(copper)); err == nil || !strings.Contains(err.Error(), "copper conductors are metal themselves") {
		t.Errorf("copper with metallic_members: got %v", err)
	}
}

// TestEmbeddedConstructionsDielectric: the embedded catalog's fibre constructions are all
// nonconductive (OFNR and OFNP listings, NFPA 70 Article 770, seen; osp-loose-tube sold
// all-dielectric, its name says so), and the media table says so for each.
func TestEmbeddedConstructionsDielectric(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	var out bytes.Buffer
	if err := c.Table(&out, 0); err != nil {
		t.Fatal(err)
	}
	for _, m := range c.Media {
		for _, k := range m.Constructions {
			if k.MetallicMembers {
				t.Errorf("%s %s: metallic members", m.ID, k.ID)
			}
			want := "none, all-dielectric"
			if !m.Fibre() {
				want = "copper conductors"
			}
			if !strings.Contains(out.String(), m.ID+" ") || !strings.Contains(out.String(), k.Name) || k.MetalText(m) != want {
				t.Errorf("%s %s: table row missing or says %q, want %q", m.ID, k.ID, k.MetalText(m), want)
			}
		}
	}
	// ANSI/TIA-568.3-D: indoor-outdoor cable of 12 fibres or fewer 1335 N, more 2670 N (from memory).
	if !strings.Contains(out.String(), "2670 (12-fibre 1335)") {
		t.Errorf("the table does not give the 12-fibre indoor-outdoor size its own pull rating:\n%s", out.String())
	}
}

// TestBondingInTheEngineCost: a construction with metallic members costs, on a link that
// leaves the buildings, the bonding of both ends of each of its cables (BondingEnds: NFPA 70
// 770.93, from memory), at metallic_member_bonding_each; on a link inside, nothing. So the
// engine weighs an armoured cable with what the bill will buy for it.
func TestBondingInTheEngineCost(t *testing.T) {
	t.Parallel()
	armoured := strings.ReplaceAll(string(catalogYAML), "metallic_members: false", "metallic_members: true")
	cat, err := ParseCatalog("armoured.yaml", []byte(armoured))
	if err != nil {
		t.Fatal(err)
	}
	book := func(extra string) *PriceBook {
		p, err := ParsePriceBook("prices.yaml", append(append([]byte(nil), pricesYAML...), extra...))
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	choose := func(p *PriceBook, l Link) Choice {
		e, err := NewEngine(cat, DefaultRules(), p, EngineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		return e.Choose(l)
	}
	// Direct-buried: only osp-loose-tube (direct_burial_rated) may be laid (rule direct-burial).
	out := Link{ID: "L", RouteM: 600, RiserM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12, PathwayTypes: []string{"buried"}}
	unpriced, priced := choose(book(""), out), choose(book("metallic_member_bonding_each: 120.00\n"), out)
	if priced.Construction != "osp-loose-tube" || unpriced.Construction != priced.Construction || priced.Medium != unpriced.Medium {
		t.Fatalf("chose %s %s and %s %s, want osp-loose-tube both times", unpriced.Medium, unpriced.Construction, priced.Medium, priced.Construction)
	}
	ends := int64(2 * len(priced.Cables))
	if got := priced.CostCents - unpriced.CostCents; got != ends*12000 || priced.CableCents-unpriced.CableCents != ends*12000 {
		t.Errorf("bonding adds %d cents (cable %d), want %d ends × 120.00", got, priced.CableCents-unpriced.CableCents, ends)
	}
	in := Link{ID: "L", RouteM: 60, RiserM: 10, RateGbps: 10, ConnectorPairs: 2, Strands: 12}
	if a, b := choose(book(""), in), choose(book("metallic_member_bonding_each: 120.00\n"), in); a.CostCents != b.CostCents {
		t.Errorf("a link inside the buildings costs %d with the bonding priced, %d without", b.CostCents, a.CostCents)
	}
	if q := BondingEnds(DefaultCatalog().Medium("os2").Construction("osp-loose-tube"), 4); q != nil {
		t.Errorf("all-dielectric cable bonded: %+v", q)
	}
	if !book("").NotPriced(PriceKey{Item: PriceBonding}) || book("metallic_member_bonding_each: 120.00\n").NotPriced(PriceKey{Item: PriceBonding}) {
		t.Error("metallic_member_bonding_each is not an optional price")
	}
}
