package install

import (
	"reflect"
	"testing"
)

// TestMemo checks that every field of Step and PullSpec is part of the memo's key (a field
// added without a line in sectionsKey fails here) and that a remembered plan equals a fresh
// one, errors included.
func TestMemo(t *testing.T) {
	steps := []Step{{Kind: KindStraight, LengthM: 80}, {Kind: KindBend, AngleDeg: 90, RadiusM: 0.6}, {Kind: KindStraight, LengthM: 120, InclineDeg: 2}}
	spec := PullSpec{WNPerM: 1.5, Mu: 0.35, TInN: 10, MaxTensionN: 2700, MaxBendDeg: 180, MaxLengthM: 300, MaxSWBPNPerM: 1000}
	points := []int{2}
	base := sectionsKey(steps, points, spec)
	bump := func(v reflect.Value) {
		switch v.Kind() {
		case reflect.String:
			v.SetString(v.String() + "x")
		case reflect.Float64:
			v.SetFloat(v.Float() + 0.5)
		default:
			t.Fatalf("unhandled kind %s", v.Kind())
		}
	}
	for i := 0; i < reflect.TypeOf(spec).NumField(); i++ {
		s := spec
		bump(reflect.ValueOf(&s).Elem().Field(i))
		if sectionsKey(steps, points, s) == base {
			t.Errorf("changing PullSpec.%s leaves the key as it was", reflect.TypeOf(spec).Field(i).Name)
		}
	}
	for i := 0; i < reflect.TypeOf(Step{}).NumField(); i++ {
		st := append([]Step(nil), steps...)
		bump(reflect.ValueOf(&st[1]).Elem().Field(i))
		if sectionsKey(st, points, spec) == base {
			t.Errorf("changing Step.%s leaves the key as it was", reflect.TypeOf(Step{}).Field(i).Name)
		}
	}
	if sectionsKey(steps, []int{1}, spec) == base || sectionsKey(steps, nil, spec) == base {
		t.Error("changing the pull points leaves the key as it was")
	}

	m := NewMemo(4)
	for _, sp := range []PullSpec{spec, {WNPerM: 1.5, Mu: -1, MaxTensionN: 2700}} {
		want, wantErr := Sections(steps, points, sp)
		for round := 0; round < 2; round++ {
			got, err := m.Sections(steps, points, sp)
			if !reflect.DeepEqual(got, want) || (err == nil) != (wantErr == nil) || (err != nil && err.Error() != wantErr.Error()) {
				t.Errorf("round %d: remembered answer differs: %+v %v, want %+v %v", round, got, err, want, wantErr)
			}
		}
	}
}

// TestMemoSharedStretch: two runs that share a stretch between pull points at different
// places along them (after a straight of another length, its straights cut into parts and
// pull points added) plan alike from one Memo and from Sections, StartM and AddedAtM to the
// bit: a remembered stretch is placed along each run with the run's own arithmetic.
func TestMemoSharedStretch(t *testing.T) {
	spec := PullSpec{WNPerM: 1.5, Mu: 0.5, MaxTensionN: 2700, MaxBendDeg: 180, MaxLengthM: 90}
	shared := []Step{{Kind: KindStraight, LengthM: 212.3}, {Kind: KindBend, AngleDeg: 45, RadiusM: 0.6},
		{Kind: KindStraight, LengthM: 61.7}, {Kind: KindBend, AngleDeg: 90, RadiusM: 0.6}, {Kind: KindStraight, LengthM: 133.1}}
	runs := [][]Step{
		append([]Step{{Kind: KindStraight, LengthM: 17.35}}, shared...),
		append([]Step{{Kind: KindStraight, LengthM: 0.1 + 0.2}, {Kind: KindStraight, LengthM: 44.4}}, shared...),
		shared,
	}
	m := NewMemo(16)
	added := 0
	for i, run := range runs {
		points := []int{len(run) - len(shared)}
		want, err := Sections(run, points, spec)
		if err != nil {
			t.Fatal(err)
		}
		got, err := m.Sections(run, points, spec)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("run %d: from the memo %+v, want %+v", i, got, want)
		}
		added += want.AddedPullPoints
	}
	if added == 0 || m.plans.Len() != 3 {
		// the shared stretch once, the two lead-ins (the third run has none before its pull point)
		t.Errorf("%d pull points added, %d stretches remembered: the test does not test the sharing", added, m.plans.Len())
	}
}
