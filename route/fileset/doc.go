// Package fileset puts a set of output files in a folder as one: every file is written under
// a temporary name first, the set replaces the old one in a single step where the system
// allows, and an output never overwrites an input. The files may be given whole (WriteFiles,
// CommitFiles) or written as they are rendered (a Set from Begin or BeginInPlace), one at a
// time (Set.Write) or side by side within a memory budget (Set.WriteParts), so that a large
// set is never held in memory; the guarantees are the same.
package fileset
