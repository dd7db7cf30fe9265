//go:build !unix

package fileset

import (
	"io/fs"
	"os"
)

// alive reports whether a process pid runs: on Windows, finding a process opens it.
func alive(pid int) bool {
	_, err := os.FindProcess(pid)
	return err == nil
}

// sameDevice cannot tell file systems apart here; a switch across them fails and says so.
func sameDevice(a, b fs.FileInfo) bool { return true }

// copyOwner has nothing to copy where files have no Unix owner.
func copyOwner(dir string, like fs.FileInfo) {}
