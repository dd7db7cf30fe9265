// Package items lists, as bill quantities, what each route-dependent thing of a plan takes:
// cable, pulls by pathway type, innerduct, trench or bore by surface with its restoration,
// added duct, handholes where new pathway joins, slack loops and waste. It is the one set of
// item functions that both the optimizer's problem (package routing) and the bill (package
// estimate) price, so a price, a rate or a design option moves both together.
package items
