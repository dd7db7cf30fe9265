package install

import "math"

// Step kinds.
const (
	KindStraight = "straight" // a straight length of duct
	KindBend     = "bend"     // a bend of the duct
)

// Pulling directions, as returned by PullBothWays and in Section.Best.
const (
	Forward = "forward" // cable fed at the run's first step, pulled out at its last
	Reverse = "reverse" // cable fed at the run's last step, pulled out at its first
)

// Step is one piece of a cable run, in the order of the run.
type Step struct {
	Kind string // KindStraight or KindBend

	// LengthM is the length of the piece in metres, >= 0. For a bend it is the arc length: it
	// counts toward section length but not toward friction, since the capstan model neglects
	// the cable's weight inside the bend; 0 is fine when the straights are measured to the
	// bend's vertex.
	LengthM float64

	AngleDeg float64 // bend only: the angle turned, degrees, in [0, 360]
	RadiusM  float64 // bend only: the bend radius of the duct, metres, > 0

	// InclineDeg is, for a straight, its slope in degrees in [−90, 90], positive when it rises
	// toward the run's last step; 0 for a level straight. It must be 0 on a bend.
	InclineDeg float64
}

// Result is the outcome of one pull through a run of Steps.
type Result struct {
	TOutN        float64   // tension at the pulling end, N
	MaxTensionN  float64   // highest tension along the pull, back tension included, N
	MaxSWBPNPerM float64   // highest sidewall bearing pressure at any bend, N/m; 0 without bends
	PerStepN     []float64 // tension leaving each step, N, in the order the cable passes them
}

// Validate reports every problem with a run and its pulling parameters: wNPerM (cable weight,
// N/m), mu (coefficient of friction) and tInN (back tension at the feed end, N) must be finite
// and >= 0, and each step must satisfy the ranges documented on Step. It returns an ErrorList
// of *InputError, or nil.
func Validate(steps []Step, wNPerM, mu, tInN float64) error {
	var errs ErrorList
	errs.checkNonNeg("", 0, "wNPerM", wNPerM)
	errs.checkNonNeg("", 0, "mu", mu)
	errs.checkNonNeg("", 0, "tInN", tInN)
	errs.checkSteps(steps)
	return errs.Err()
}

func (l *ErrorList) checkSteps(steps []Step) {
	for i, s := range steps {
		l.checkNonNeg("step", i, "LengthM", s.LengthM)
		switch s.Kind {
		case KindStraight:
			if !finite(s.InclineDeg) || s.InclineDeg < -90 || s.InclineDeg > 90 {
				*l = append(*l, &InputError{Item: "step", Index: i, Field: "InclineDeg", Got: fmtNum(s.InclineDeg), Want: "in [-90, 90]"})
			}
		case KindBend:
			if !finite(s.AngleDeg) || s.AngleDeg < 0 || s.AngleDeg > 360 {
				*l = append(*l, &InputError{Item: "step", Index: i, Field: "AngleDeg", Got: fmtNum(s.AngleDeg), Want: "in [0, 360]"})
			}
			l.checkPos("step", i, "RadiusM", s.RadiusM)
			if s.InclineDeg != 0 {
				*l = append(*l, &InputError{Item: "step", Index: i, Field: "InclineDeg", Got: fmtNum(s.InclineDeg), Want: "0 on a bend"})
			}
		default:
			*l = append(*l, &InputError{Item: "step", Index: i, Field: "Kind", Got: quote(s.Kind), Want: `"straight" or "bend"`})
		}
	}
}

func quote(s string) string { return `"` + s + `"` }

// Tension pulls a cable of weight wNPerM (N/m) with friction coefficient mu through steps in
// their order, starting with back tension tInN (N) at the feed end, and returns the tension at
// the pulling end (N), the highest sidewall bearing pressure at any bend (N/m) and the tension
// leaving each step (N).
//
// A level straight adds W·L·μ. A straight on an incline φ adds W·L·(sin φ + μ·cos φ) (from
// memory); going down this can be negative, and the tension then stops at 0 because a cable
// cannot push (common practice, no published source). A bend multiplies the tension by e^(μθ),
// θ in radians (capstan equation), and bears on its wall with SWBP = T_out/R. Tension panics,
// with a message starting "install: ", if Validate reports a problem: check input from users
// with Validate first. Time O(len(steps)).
func Tension(steps []Step, wNPerM, mu, tInN float64) (tOutN float64, maxSWBPNPerM float64, perStep []float64) {
	r := pull(steps, false, wNPerM, mu, tInN)
	return r.TOutN, r.MaxSWBPNPerM, r.PerStepN
}

// PullBothWays pulls the run from each end, as Tension does: forward feeds the cable at
// steps[0], reverse at the last step (steps taken in reverse order, inclines negated). best is
// Reverse when the reverse pull's MaxTensionN is strictly lower, and Forward otherwise. It
// panics, like Tension, if Validate reports a problem.
func PullBothWays(steps []Step, wNPerM, mu, tInN float64) (forward, reverse Result, best string) {
	forward = pull(steps, false, wNPerM, mu, tInN)
	reverse = pull(steps, true, wNPerM, mu, tInN)
	best = Forward
	if reverse.MaxTensionN < forward.MaxTensionN {
		best = Reverse
	}
	return forward, reverse, best
}

// MaxStraightM is the longest level straight that a cable of weight wNPerM (N/m) can be pulled
// through with friction coefficient mu before the tension reaches maxTensionN (N), from zero
// back tension: L = T_max/(W·μ), in metres. The formula is homogeneous: lbf and lbf/ft give
// feet. Inputs are taken as >= 0; it is +Inf when W·μ is 0.
func MaxStraightM(maxTensionN, wNPerM, mu float64) float64 {
	if wNPerM*mu == 0 {
		return math.Inf(1)
	}
	return maxTensionN / (wNPerM * mu)
}

func pull(steps []Step, reverse bool, w, mu, tIn float64) Result {
	if err := Validate(steps, w, mu, tIn); err != nil {
		panic("install: invalid pull, call Validate first: " + err.Error())
	}
	return tension(steps, reverse, w, mu, tIn, true)
}

// tension is pull on steps already validated; PerStepN is left nil unless perStep.
func tension(steps []Step, reverse bool, w, mu, tIn float64, perStep bool) Result {
	r := Result{MaxTensionN: tIn}
	if perStep {
		r.PerStepN = make([]float64, len(steps))
	}
	t := tIn
	for k := range steps {
		s, sign := steps[k], 1.0
		if reverse {
			s, sign = steps[len(steps)-1-k], -1
		}
		switch s.Kind {
		case KindStraight:
			if s.InclineDeg == 0 {
				t += w * s.LengthM * mu
			} else {
				phi := sign * s.InclineDeg * math.Pi / 180
				t += w * s.LengthM * (math.Sin(phi) + mu*math.Cos(phi))
			}
			t = math.Max(t, 0)
		case KindBend:
			t *= math.Exp(mu * s.AngleDeg * math.Pi / 180)
			r.MaxSWBPNPerM = math.Max(r.MaxSWBPNPerM, t/s.RadiusM)
		}
		if perStep {
			r.PerStepN[k] = t
		}
		r.MaxTensionN = math.Max(r.MaxTensionN, t)
	}
	r.TOutN = t
	return r
}
