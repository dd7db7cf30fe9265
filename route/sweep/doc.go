// Package sweep plans many alternatives of one plan in bulk, on one machine or as the tasks
// of an array job, and compares them.
//
// # Sweep file
//
// A sweep file is YAML:
//
//	base: plan.yaml                 # the plan the scenarios start from, relative to this file
//	vary:                           # the cartesian product of these axes
//	  hub: [ADM, ENG]
//	  defaults.rate: [10G, 25G]
//	  prices: [prices-low.yaml, prices-high.yaml]
//	  design.allow_new_trench: [true, false]
//	cases:                          # and named cases, each a set of overrides
//	  - {name: all-diverse, defaults.redundancy: diverse}
//
// Keys are dotted paths into the plan: name, hub, budget, campus, catalog, rules, prices, and
// every key of defaults and design (defaults.rate, design.snap_m, ...); the list is read from
// route.Plan, so a setting the plan gains can be varied at once. The links list cannot be
// varied: write another plan. A value must suit the setting (a number for design.snap_m,
// true or false for design.allow_new_trench); null (~) removes the key from the plan, so the
// plan's default applies. File names (campus, catalog, rules, prices) are relative to the
// sweep file's folder. In a case, name is the case's name, not the plan's.
//
// An unknown key or a value of the wrong type stops the sweep before it starts, with an
// *input.Problem (matching ErrInvalid) naming the file, line and column, case ("vary" for an
// axis) and key; every problem is reported at once. Values of the right type that the plan rejects (an unknown hub, a
// rate no application runs at, a price book that is not there) are found with
// Options.Preflight, which the command sets, before anything is planned or written: every
// scenario's plan, files, campus, engine and route.Check, and that every price book is in
// one currency (the comparison ranks totals), every problem at once, each at the
// value's place in the sweep file (see preflight); without it they fail only their scenario.
//
// # Scenarios
//
// The scenarios are the product of the axes, then each case applied to the base plan alone
// (not on top of the product): with both vary and cases there are
// len(values 1) × … × len(values n) + len(cases) scenarios. The order is fixed: the product
// first, the first axis varying slowest and values in file order, then the cases in file
// order. Index is the 0-based position in that order.
//
// Each scenario has an id (see ScenarioID): a readable slug and eight hexadecimal digits of
// the SHA-256 of its canonical override list, such as adm-10g-prices-low-allow_new_trench-6d7bb237
// or all-diverse-bcb3603c. A scenario keeps its id when the sweep gains values or cases, so
// a grown sweep resumes; a new axis changes the overrides, so the ids, of the whole product.
//
// Each scenario's plan is the base plan's YAML with the overrides applied to its node tree,
// file names made relative to the scenario's folder, then read by route.ParsePlan, so all
// plan validation applies. Its header comment names the scenario and, for a warm-started one,
// the base scenario it started from and the `spanwright plan --start-from` command that
// reproduces it (warmHeader; no path of the output folder, no time).
//
// # Output folder
//
// Run writes, under the output folder:
//
//	<id>/plan.yaml       the scenario's plan; `spanwright plan <id>/plan.yaml` re-plans it
//	<id>/inputs.sha256   SHA-256 of plan.yaml and of every file it reads, in the format of GNU
//	                     sha256sum, so `sha256sum -c inputs.sha256` in the folder checks them
//	<id>/routes.geojson, links.csv, summary.json, …   the plan's outputs (output.Files,
//	                     and Options.Extra)
//	<id>/outputs.sha256  SHA-256 of those outputs, as GNU sha256sum writes it; a resumed sweep
//	                     plans the base scenario again when its outputs no longer match
//	<id>/error.txt       for a failed scenario, instead of the outputs: why it failed
//	rows.jsonl           one JSON object per scenario (a header line first), in index order
//	compare.csv, compare.xlsx, compare.md   the comparison, see Compare
//
// rows.jsonl starts with a header line, {"format":"spanwright sweep rows 2","sweep":…,
// "scenarios":N,"keys":[…]}, where sweep is the SHA-256 of the base plan's hash and the
// scenario ids (so shards of another sweep, or of another version of the base plan, are not
// merged) and keys are the override keys; then one Row per line in index order. A rows file
// of another format (RowsFormat) is refused with its format named.
//
// Scenario folders appear whole or not at all (written under .tmp-<id>.* and renamed). With
// Options.Resume a scenario whose folder holds summary.json of output.SummaryFormat and an
// inputs.sha256 equal to the one it would write now is not planned again (plan.yaml names the
// output units when they are not metric, so a change of units plans again); one whose
// summary.json is of another format (an earlier spanwright's) is planned again, and a note
// of Report.Notes names it. A sharded run (Options.Shard, i of n) plans
// the scenarios whose index modulo n is i-1 and writes rows-i-of-n.jsonl instead of rows.jsonl
// and the comparison; Merge joins the rows files of every shard into the comparison, byte for
// byte what the unsharded sweep writes. Shards may share one output folder or use one each.
//
// # Outcome
//
// Report.Err sums up a finished run: nil when every scenario planned with all legs
// feasible, an error wrapping ErrScenarioFailed when some scenario failed (the command exits
// with status 2, after writing every other scenario and the comparison), else one wrapping
// route.ErrInfeasible (status 3). A failed scenario outweighs infeasible ones: results are
// missing, not just imperfect.
//
// Output bytes depend only on the inputs: rows are written in index order whatever the
// number of workers, money with two decimals, no timestamps.
package sweep
