// Package route plans one scenario: it resolves the plan's hub and links on a site (package
// site), checks them, routes every link and chooses its media (package routing), estimates
// and prices the installation (package estimate), and hands back the Result that the writers
// (package output) render.
//
// Lengths are metres and money integer cents throughout; imperial units exist only in the
// writers, at the edge.
package route
