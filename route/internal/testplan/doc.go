// Package testplan is for tests: plans solved end to end on the test campuses of package
// testsite, and lookups into their results, outputs and bills.
package testplan
