// Package optimize chooses, for every demand of a campus backbone, a cable medium and a route
// over the pathway network that together minimise the installed cost of the whole plan.
//
// The package is a pure algorithm: it sees nodes as indices 0..N-1, edges as indices into
// Problem.Edges, lengths in metres and money in integer cents. It knows nothing of GeoJSON,
// catalogs or price books; package route builds a Problem from those and reads the Solution.
//
// The cost of a plan is, summed exactly in cents,
//
//	Σ demands Σ legs Σ edges   round(CableM × CablePerMCents) + round(LengthM × LabourPerMCents) + PerCableCents
//	+ Σ opened proposed edges FixedCents (paid once, however many cables use the edge)
//	+ Σ added ducts            round(LengthM × AddDuctPerMCents)
//	+ Σ edges with added ducts round(LengthM × AddTrenchPerMCents) (once per edge)
//	+ Σ demands                Option.FixedCents (+ Option.SecondLegCents with a diverse pair)
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
// All decisions are deterministic: fixed orders, no map iteration, no goroutines, so the same
// Problem gives the same Solution on any machine and any GOMAXPROCS.
package optimize
