// Command campusfiles writes a generated campus (route/internal/campusgen) and a plan for it
// to a folder, so that the spanwright binary can be timed on it:
//
//	go run ./route/internal/campusgen/campusfiles -buildings 5000 -out /tmp/campus5000
//	/usr/bin/time -v spanwright check /tmp/campus5000/plan.yaml
//	/usr/bin/time -v spanwright plan --out /tmp/out5000 /tmp/campus5000/plan.yaml
//
// The campus is invented; see campusgen.
package main

import (
	"flag"
	"fmt"
	"os"

	"spanwright/route/internal/campusgen"
)

func main() {
	opt := campusgen.BenchOptions(1000)
	seed := flag.Uint64("seed", 1, "generator seed")
	flag.IntVar(&opt.Buildings, "buildings", opt.Buildings, "buildings, cross-connects included")
	flag.Float64Var(&opt.PathwaysPerBuilding, "per-building", opt.PathwaysPerBuilding, "pathway features per building (0: one street per building)")
	flag.Float64Var(&opt.ProposedPct, "proposed", opt.ProposedPct, "percent of street pathways proposed (0: 10-30 at random)")
	diverse := flag.Int("diverse-every", 4, "every Nth building of those with two laterals gets a diverse link (0: none)")
	out := flag.String("out", "", "folder to write campus.geojson and plan.yaml into")
	flag.Parse()
	if *out == "" {
		fmt.Fprintln(os.Stderr, "campusfiles: -out is required")
		os.Exit(2)
	}
	c := campusgen.Generate(*seed, opt)
	if err := campusgen.WriteFiles(*out, c, *diverse); err != nil {
		fmt.Fprintln(os.Stderr, "campusfiles:", err)
		os.Exit(1)
	}
	fmt.Println(c.Stats())
}
