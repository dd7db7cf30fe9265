// Package starter writes editable starter inputs into a folder: a small invented campus of
// its own (not the demo campus), a plan that routes it, and a price-book template whose every
// key is explained in comments, so that a new user starts from files of their own. It never
// replaces a file that exists.
package starter
