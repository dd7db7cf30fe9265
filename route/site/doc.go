// Package site turns a campus into what a plan routes over: the noded pathway network and its
// weighted graph (gonum), the buildings' entrances, the links the plan asks for between
// buildings, and the facts of junctions and structures along a route.
package site
