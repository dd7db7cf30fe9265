//go:build unix

package fileset

import (
	"errors"
	"io/fs"
	"os"
	"syscall"
)

// alive reports whether a process pid runs (or may: one we may not signal counts as running).
func alive(pid int) bool {
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}

// sameDevice reports whether two files are on the same file system.
func sameDevice(a, b fs.FileInfo) bool {
	sa, ok1 := a.Sys().(*syscall.Stat_t)
	sb, ok2 := b.Sys().(*syscall.Stat_t)
	return !ok1 || !ok2 || sa.Dev == sb.Dev
}

// copyOwner gives dir the owner and group of the folder it replaces, where we may (run as
// root in a user's folder, the new one would be root's); otherwise it stays ours.
func copyOwner(dir string, like fs.FileInfo) {
	if st, ok := like.Sys().(*syscall.Stat_t); ok {
		os.Lchown(dir, int(st.Uid), int(st.Gid))
	}
}
