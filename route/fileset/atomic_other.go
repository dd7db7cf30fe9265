//go:build !linux

package fileset

// exchangeFolders is not available outside Linux: WriteFiles switches folders with two renames.
func exchangeFolders(a, b string) error { return errNoExchange }
