// Package media selects the cable medium and application for each backbone link, proves each
// fibre link closes its optical loss budget, and prices it from a price book.
//
// It imports no package of this project: plain facts in (Link), plain decisions out (Choice).
// Lengths are metres, losses dB, rates Gbit/s and money integer cents of the price book's currency.
//
// Three YAML files drive it, each embedded as a default and replaceable by a file of the
// same form: catalog.yaml (media, constructions and the IEEE 802.3 applications on them,
// read by ParseCatalog), rules.yaml (ordered declarative rules over the facts FactList
// documents, read by ParseRules) and prices-demo.yaml (a price book of invented prices, read
// by ParsePriceBook). Every value in the catalog names its source. The readers report every
// problem of a file at once as an *input.Problems (spanwright/geo/input), each naming the file, line,
// column, item and field; callers test the cause with errors.Is and the Err* sentinels.
//
// An Engine joins the three: Choose decides one link, and MaxChannelM, CablePerMCents and
// FixedCents give a route optimizer the reach and cost parts of each medium.
package media
