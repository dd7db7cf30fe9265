// Package media selects the cable medium and application for each backbone link, proves each
// fibre link closes its optical loss budget, and prices it from a price book.
//
// It imports no package of this project: plain facts in (Link), plain decisions out (Choice).
// Lengths are metres, losses dB, rates Gbit/s and money integer cents of the price book's currency.
package media
