// Package routing states a plan's routing problem and turns its solution into legs: it prices
// every span and link with the item functions (package items) into an optimizer problem,
// keeps each medium off the spans the rule engine forbids it (span classes), hands the problem
// to package optimize in canonical order, and gives each routed leg its cable takeoff and the
// medium the rule engine chooses on the route's own facts.
package routing
