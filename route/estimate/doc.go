// Package estimate turns a routed plan into what an installer and an estimator need: the
// pulling plan of every cable (pull points, tensions, sidewall pressure), the fill of every
// duct, the connectivity each building terminates, the new construction, and the bill of
// materials priced with the same item functions the optimizer used (package items).
package estimate
