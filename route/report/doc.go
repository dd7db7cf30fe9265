// Package report renders a planned scenario, and a sweep's comparison, as one self-contained
// HTML file each: inline CSS and SVG, no script or font fetched from anywhere, readable on
// screen and printed on A3.
//
// The plan report (Plan, file report.html) draws a map of the campus from its geometry in a
// local equirectangular projection, north up, with a scale bar and a legend: building
// footprints with their ids, existing pathways by type, proposed trench dashed, high-EMI spans
// marked, structures, and each feasible leg in the TIA-598 jacket colour of its medium with
// the medium named beside the colour. It then gives the summary against the budget, cost by
// category, links by medium, the per-leg table (infeasible legs first), the duct fill, the
// warnings, the safety cautions and the sources of the standard values.
//
// The sweep report (Sweep, file compare.html) holds the comparison table, sortable by a small
// inline script (the table reads in scenario order without it), and a cost-versus-margin
// scatter plot of every planned scenario with the Pareto-optimal ones marked.
//
// Every text that comes from the input (names, ids, reasons, warnings) goes through
// html/template and renders as text; the rendered page then passes through escape.HTML, which
// shows bidirectional controls and other hidden characters as "<U+202E>". Output bytes depend only on the input: no timestamps,
// sorted lists, fixed decimals.
package report
