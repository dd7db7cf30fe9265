// Package install works out the installation mechanics of a cable run: whether cables fit a
// duct (NFPA 70 Chapter 9 fill and jam ratio) and how hard a cable must be pulled through a run
// of straights and bends (capstan equation), where pull points go, and from which end to pull.
//
// It imports no package of this project: plain numbers in, plain results out. Lengths are
// metres, diameters millimetres, areas square millimetres, forces newtons, cable weight newtons
// per metre, sidewall bearing pressure newtons per metre of bend radius, angles degrees. The
// pulling formulas are homogeneous, so any consistent set of units works (the tests run a
// handbook example in pound-force and feet); the unit helpers convert at the output edges.
//
// Functions that take a run of Steps document which input they reject; Validate reports every
// problem of a run at once, as an ErrorList of *InputError wrapping ErrBadInput.
package install
