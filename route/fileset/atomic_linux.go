package fileset

import (
	"errors"

	"golang.org/x/sys/unix"
)

// exchangeFolders swaps the folders a and b in one step (renameat2 RENAME_EXCHANGE, Linux 3.15 and
// later); errNoExchange when the kernel or the file system cannot.
func exchangeFolders(a, b string) error {
	err := unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
	if errors.Is(err, unix.ENOSYS) || errors.Is(err, unix.EINVAL) || errors.Is(err, unix.ENOTSUP) {
		return errNoExchange
	}
	return err
}
