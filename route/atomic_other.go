//go:build !linux

package route

// exchangeFolders is not available outside Linux: WriteFiles switches folders with two renames.
func exchangeFolders(a, b string) error { return errNoExchange }
