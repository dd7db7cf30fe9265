// Package optimize chooses, for every demand of a campus backbone, a cable medium and a route
// over the pathway network that together minimise the installed cost of the whole plan.
//
// The package is a pure algorithm: it sees nodes as indices 0..N-1, edges as indices into
// Problem.Edges, lengths in metres and money in integer cents. It knows nothing of GeoJSON,
// catalogs or price books; package route builds a Problem from those and reads the Solution.
//
// The cost of a plan is, summed exactly in cents,
//
//	Σ demands Σ legs Σ edges   round(CableM × CablePerMCents) + Cables × (round(LengthM × LabourPerMCents) + PerCableCents)
//	+ Σ opened proposed edges FixedCents (paid once, however many cables use the edge)
//	+ Σ paid charges           Charge.Cents (once, however many of its edges and cables)
//	+ Σ existing edges with added ducts
//	                           LaidDucts(added) × round(LengthM × AddDuctPerMCents)
//	                           + round(LengthM × AddTrenchPerMCents) + AddTrenchCents (once per edge)
//	+ Σ opened proposed edges  added × round(LengthM × AddDuctPerMCents) (ducts beyond Edge.Ducts)
//	+ Σ demands                Option.FixedCents (+ Option.SecondLegCents with a diverse pair)
//
// A charge (Problem.Charges) is paid when at least one leg of any demand uses at least one
// of its edges, existing or proposed; on a proposed edge it is paid besides the edge's
// FixedCents. Each paid charge is split among the demands that use it, as an opened edge's
// FixedCents is among its users (Breakdown.ChargeShareCents; Solution.Charged lists them).
// The searches price a charge not yet paid by another demand on each of its edges that a
// path takes, and one already paid as free; a path that takes two edges of one unpaid charge
// is thus priced above its cost, which only the plan cost, counting each charge once, decides.
//
// A node marked in Problem.NoTransit is never an interior node of a leg: a leg may start or
// end there, but no search passes through it. A building with several entrances is one such
// node joined by zero-length edges to its entrances; a diverse pair from it leaves by two of
// those edges (its legs share no edge), and with one such edge that edge is the single point
// of failure reported.
//
// Nodes with one Problem.Sites number are one place (a junction drawn as one node per run of
// duct through it): a diverse pair whose legs pass one place is taken only when the searches
// find no pair that does not, whatever it costs (a place shared is a single point of failure,
// as a node shared would be), and the plan's cost compares after the number of such pairs.
//
// Solve decides the medium and the route together, keeps every demand within its medium's
// reach, shares new trench between demands (a fixed-charge network design problem, solved by
// local search), finds diverse pairs for demands that need them and respects duct fill.
//
// The pathway graph is a gonum multigraph (multi.WeightedUndirectedGraph, one line per edge,
// line UID = edge index), built when Network.Graph is first called. The hot loops (thousands of
// shortest-path searches per solve) run on a flat adjacency array of the same edges, because
// gonum's generic interfaces allocate an iterator and look up maps on every step; gonum's own
// algorithms are used where their cost does not matter (connectivity diagnosis, through a
// View) and as independent references in the tests.
//
// All decisions are deterministic: fixed orders, no map iteration, and one goroutine beside
// the solve, the lower bound's ascent, which reads only what is fixed before it starts and
// whose result is taken at fixed points of the search (joinDual), so the same Problem gives
// the same Solution on any machine and any GOMAXPROCS.
package optimize
