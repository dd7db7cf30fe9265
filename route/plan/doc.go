// Package plan reads a plan file (hub, links, defaults, design, the catalog, rules and price
// book it names), checks every key against its declared range, and builds the plan's media
// engine; it knows nothing of the campus.
package plan
