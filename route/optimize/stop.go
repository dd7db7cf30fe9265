package optimize

// Stopping. SolveContext gives up when its context is done: every loop of the search checks
// stopped at its head (the starts per demand, the local search per round, demand, edge and
// candidate, the perturbations per kick, the pair branching per try, LARAC per iteration and
// the label search every labelCheckEvery labels), so a stop ends the solve within one step of
// one of them, and no partial plan comes out. A context that is never done changes nothing:
// the checks make no decision.

// labelCheckEvery is how many labels the exact reach search pops between two looks at the
// context: a pop costs tens of nanoseconds, a look a few.
const labelCheckEvery = 1024

// stopped reports whether the solve's context is done. It costs one atomic load until it
// first returns true, and then stays true, so a loop that ends on it leaves every loop
// around it to end at its next head as well.
func (sv *solver) stopped() bool {
	if !sv.halted && sv.ctx.Err() != nil {
		sv.halted = true
		sv.abandon.Store(true) // the ascent beside the solve (ascendAsync) gives up too
	}
	return sv.halted
}

// stopper is what the free-standing searches (larac, labelSearch) ask whether to give up; nil
// never stops.
type stopper func() bool

func (s stopper) stop() bool { return s != nil && s() }
