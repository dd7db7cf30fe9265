//go:build !linux

package route

// exchange is not available outside Linux: WriteFiles switches folders with two renames.
func exchange(a, b string) error { return errNoExchange }
