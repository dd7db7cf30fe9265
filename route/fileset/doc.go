// Package fileset puts a set of output files in a folder as one: every file is written under
// a temporary name first, the set replaces the old one in a single step where the system
// allows, and an output never overwrites an input.
package fileset
