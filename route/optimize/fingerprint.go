package optimize

import (
	"crypto/sha256"
	"encoding/binary"
	"math"
)

// Fingerprint is the SHA-256 of everything Solve's answer depends on: the problem's nodes,
// edges, demands and their options, AllowNew, NoTransit, Charges, Sites, and the settings. Solve is deterministic, so
// two calls with the same fingerprint return the same solution; callers that plan many
// variants of one campus (a sweep) use it to solve each distinct problem once. ok is false
// when the problem has a custom Fits function, which cannot be fingerprinted.
func Fingerprint(p *Problem, opt Settings) (sum [sha256.Size]byte, ok bool) {
	if p.Fits != nil {
		return sum, false
	}
	f := fingerprinter{b: make([]byte, 0, 64*len(p.Edges)+96*len(p.Demands)+64)}
	f.str(opt.Objective)
	f.int(int64(opt.MaxRounds))
	if opt.PlaceOnly { // only when set: the bytes without it are as before
		f.str("place only")
	}
	if len(opt.Start) > 0 { // only when given: the bytes without a start are as before
		f.int(int64(len(opt.Start)))
		for _, r := range opt.Start {
			f.str(r.ID)
			f.int(int64(r.Option))
			f.int(int64(len(r.Legs)))
			for _, leg := range r.Legs {
				f.int(int64(len(leg)))
				for _, h := range leg {
					f.int(int64(h.Edge))
					f.bool(h.Forward)
				}
			}
		}
	}
	f.int(int64(p.Nodes))
	f.bool(p.AllowNew)
	f.int(int64(len(p.Edges)))
	for i := range p.Edges {
		e := &p.Edges[i]
		f.str(e.ID)
		f.int(int64(e.From))
		f.int(int64(e.To))
		f.float(e.LengthM)
		f.int(e.LabourPerMCents)
		f.float(e.CableM)
		f.float(e.ReachM)
		f.int(e.PerCableCents)
		f.bool(e.Proposed)
		f.int(e.FixedCents)
		f.int(int64(e.Group))
		f.bool(e.EndParted)
		f.uint(e.Flags)
		f.int(int64(e.Ducts))
		f.float(e.DuctIDMM)
		f.int(e.AddDuctPerMCents)
		f.int(e.AddTrenchPerMCents)
		f.int(e.AddTrenchCents)
		f.int(int64(e.AddTrenchDucts))
		f.bool(e.Innerduct)
		f.int(int64(e.CablesPerDuct))
	}
	f.int(int64(len(p.Demands)))
	for i := range p.Demands {
		d := &p.Demands[i]
		f.str(d.ID)
		f.int(int64(d.Source))
		f.int(int64(d.Target))
		f.bool(d.Diverse)
		f.int(int64(len(d.Options)))
		for j := range d.Options {
			o := &d.Options[j]
			f.str(o.Name)
			f.int(o.CablePerMCents)
			f.int(o.FixedCents)
			f.int(o.SecondLegCents)
			f.float(o.MaxRouteM)
			f.uint(o.ExcludeFlags)
			f.float(o.CableODMM)
			f.int(int64(o.Cables))
		}
	}
	// Transit-free nodes and charges, only when present: the bytes of a problem without them
	// are as before (every field above is self-delimiting, so no problem's bytes are a prefix
	// of another's).
	if len(p.NoTransit) > 0 || len(p.Charges) > 0 {
		f.int(int64(len(p.NoTransit)))
		for _, v := range p.NoTransit {
			f.bool(v)
		}
		f.int(int64(len(p.Charges)))
		for i := range p.Charges {
			c := &p.Charges[i]
			f.str(c.ID)
			f.int(c.Cents)
			f.int(int64(len(c.Edges)))
			for _, e := range c.Edges {
				f.int(int64(e))
			}
		}
	}
	// Places drawn as several nodes, only when present (as above).
	if len(p.Sites) > 0 {
		f.str("sites")
		f.int(int64(len(p.Sites)))
		for _, x := range p.Sites {
			f.int(int64(x))
		}
	}
	return sha256.Sum256(f.b), true
}

// fingerprinter appends fields in a fixed binary form: integers and float bits as 8 bytes,
// strings length-prefixed, so no two different field sequences give the same bytes.
type fingerprinter struct{ b []byte }

func (f *fingerprinter) uint(v uint64) { f.b = binary.LittleEndian.AppendUint64(f.b, v) }
func (f *fingerprinter) int(v int64)   { f.uint(uint64(v)) }
func (f *fingerprinter) float(v float64) {
	if v == 0 {
		v = 0 // -0 and +0 solve alike
	}
	f.uint(math.Float64bits(v))
}
func (f *fingerprinter) str(s string) { f.int(int64(len(s))); f.b = append(f.b, s...) }
func (f *fingerprinter) bool(v bool) {
	if v {
		f.b = append(f.b, 1)
	} else {
		f.b = append(f.b, 0)
	}
}
