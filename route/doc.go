// Package route owns the pathway graph, the plan file and the plan pipeline: it reads a plan,
// builds the campus network, decides which links the backbone needs, routes them, asks the
// media rule engine which medium each uses, and writes the plan's outputs.
//
// Lengths are metres and money integer cents throughout; imperial units exist only in the
// writers, at the edge.
package route
