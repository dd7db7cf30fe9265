package install

import (
	"encoding/binary"
	"math"

	lru "github.com/hashicorp/golang-lru/v2"
)

// Memo remembers the plans of the stretches of duct between given pull points that Sections
// splits a run into, for callers that plan the same ducts again and again: the legs of one
// campus share their trunk stretches, and every scenario of a sweep pulls the same cables
// through the same ducts. A stretch's plan is a pure function of its steps and the spec, so a
// plan made of remembered stretches equals a fresh one. It keeps at most the size given to
// NewMemo stretches, dropping the least recently used. It is safe for concurrent use; the
// Steps and PerStepN slices of the Sections it returns are shared and must not be modified.
type Memo struct {
	plans *lru.Cache[string, []stretchSection]
}

// NewMemo returns a Memo that keeps at most size stretches' plans (at least one).
func NewMemo(size int) *Memo {
	c, _ := lru.New[string, []stretchSection](max(size, 1)) // errs only on a size <= 0
	return &Memo{plans: c}
}

// Sections is Sections(steps, pullPoints, spec), its stretches remembered.
func (m *Memo) Sections(steps []Step, pullPoints []int, spec PullSpec) (Plan, error) {
	return sections(steps, pullPoints, spec, m)
}

// stretch is spec.stretch(steps), remembered.
func (m *Memo) stretch(steps []Step, spec PullSpec) []stretchSection {
	k := sectionsKey(steps, nil, spec)
	if v, ok := m.plans.Get(k); ok {
		return v
	}
	v := spec.stretch(steps)
	m.plans.Add(k, v)
	return v
}

// sectionsKey encodes every argument of Sections: floats by their bits, strings and slices
// length-prefixed, so different arguments never share a key.
func sectionsKey(steps []Step, pullPoints []int, spec PullSpec) string {
	b := make([]byte, 0, 8*(2+7+len(pullPoints))+len(steps)*(8*5+8))
	u := func(v uint64) { b = binary.LittleEndian.AppendUint64(b, v) }
	f := func(v float64) { u(math.Float64bits(v)) }
	for _, v := range []float64{spec.WNPerM, spec.Mu, spec.TInN, spec.MaxTensionN, spec.MaxBendDeg, spec.MaxLengthM, spec.MaxSWBPNPerM} {
		f(v)
	}
	u(uint64(len(steps)))
	for _, s := range steps {
		u(uint64(len(s.Kind)))
		b = append(b, s.Kind...)
		f(s.LengthM)
		f(s.AngleDeg)
		f(s.RadiusM)
		f(s.InclineDeg)
	}
	u(uint64(len(pullPoints)))
	for _, p := range pullPoints {
		u(uint64(p))
	}
	return string(b)
}

// Purge forgets every remembered plan.
func (m *Memo) Purge() { m.plans.Purge() }
