package input

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"
)

// MiB is a mebibyte, in bytes.
const MiB = 1 << 20

// Default size caps of an input file, in MiB. A campus GeoJSON file (and a sweep's rows
// file) may be large; a plan, sweep file, catalog, rule file or price book is a few hundred
// lines, so a much smaller cap catches a wrong file name early.
const (
	DefaultDataMiB = 512 // campus GeoJSON, sweep rows files
	DefaultTextMiB = 16  // YAML: plan, sweep file, catalog, rules, price book
)

// LimitFlag is the name of the command-line flag that sets the cap of every input file, in
// MiB; messages about a file over its cap name it.
const LimitFlag = "max-input-mb"

// Sentinels of ReadFile's errors, for errors.Is.
var (
	// ErrNotRegular is a path that names a named pipe, device, socket or folder.
	ErrNotRegular = errors.New("not a regular file")
	// ErrTooLarge is a file larger than the cap it was read with.
	ErrTooLarge = errors.New("file too large")
)

// problem is an error with its own text that unwraps to a sentinel.
type problem struct {
	kind error
	msg  string
}

func (p *problem) Error() string { return p.msg }
func (p *problem) Unwrap() error { return p.kind }

// Cap returns maxBytes when it is above 0, and defMiB MiB otherwise: the cap of a file kind
// whose default is defMiB, under a command-line setting of maxBytes (0 when not given).
func Cap(maxBytes int64, defMiB int64) int64 {
	if maxBytes > 0 {
		return maxBytes
	}
	return defMiB * MiB
}

// ReadFile reads the file at path whole, following symbolic links. It refuses, before
// reading a byte, anything but a regular file (a named pipe would block, a device such as
// /dev/zero never ends) and a file larger than maxBytes; a file that grows while it is read
// is cut off at maxBytes+1 bytes and refused too. Errors are *fs.PathError with Op "read"
// whose Err wraps ErrNotRegular or ErrTooLarge, or the operating system's error.
func ReadFile(path string, maxBytes int64) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if err := check(path, st, maxBytes); err != nil {
		return nil, err
	}
	// O_NONBLOCK: should the path have become a named pipe since the Stat, opening it must
	// not wait for a writer; the Stat of the open file below then refuses it.
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if st, err = f.Stat(); err != nil {
		return nil, err
	}
	if err := check(path, st, maxBytes); err != nil {
		return nil, err
	}
	return readCapped(path, f, st.Size(), maxBytes)
}

// CheckFile refuses, as ReadFile does but without reading it, a path that is not a regular
// file or is larger than maxBytes: for a file that a library opens itself (a GeoPackage,
// through SQLite). Errors are as ReadFile's.
func CheckFile(path string, maxBytes int64) error {
	st, err := os.Stat(path)
	if err != nil {
		return err
	}
	return check(path, st, maxBytes)
}

// Cause is err without the *fs.PathError around it, whose operation and path a message that
// names the file already would repeat: "not a regular file but a folder; …", "no such file
// or directory".
func Cause(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// ReadFS is ReadFile reading the named file from fsys.
func ReadFS(fsys fs.FS, name string, maxBytes int64) ([]byte, error) {
	st, err := fs.Stat(fsys, name)
	if err != nil {
		return nil, err
	}
	if err := check(name, st, maxBytes); err != nil {
		return nil, err
	}
	f, err := fsys.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return readCapped(name, f, st.Size(), maxBytes)
}

func readCapped(path string, r io.Reader, size, maxBytes int64) ([]byte, error) {
	// One byte more than the size found, so reading to the end needs no second buffer.
	buf := make([]byte, 0, min(size, maxBytes)+1)
	lr := io.LimitReader(r, maxBytes+1)
	for {
		if len(buf) == cap(buf) {
			buf = append(buf, 0)[:len(buf)] // the file grew since its size was read
		}
		n, err := lr.Read(buf[len(buf):cap(buf)])
		buf = buf[:len(buf)+n]
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, &fs.PathError{Op: "read", Path: path, Err: err}
		}
	}
	if int64(len(buf)) > maxBytes {
		return nil, tooLarge(path, maxBytes)
	}
	return buf, nil
}

// check refuses a file that is not regular or is larger than maxBytes.
func check(path string, st fs.FileInfo, maxBytes int64) error {
	if !st.Mode().IsRegular() {
		return &fs.PathError{Op: "read", Path: path, Err: &problem{ErrNotRegular,
			fmt.Sprintf("not a regular file but %s; spanwright reads only regular files", modeName(st.Mode()))}}
	}
	if st.Size() > maxBytes {
		return tooLarge(path, maxBytes)
	}
	return nil
}

func tooLarge(path string, maxBytes int64) error {
	return &fs.PathError{Op: "read", Path: path, Err: &problem{ErrTooLarge,
		fmt.Sprintf("larger than the input limit of %s (raise it with --%s)", sizeText(maxBytes), LimitFlag)}}
}

// sizeText writes a cap in MiB when it is a whole number of them, else in bytes.
func sizeText(b int64) string {
	if b%MiB == 0 {
		return fmt.Sprintf("%d MiB", b/MiB)
	}
	return fmt.Sprintf("%d bytes", b)
}

func modeName(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeCharDevice != 0:
		return "a character device"
	case m&fs.ModeDevice != 0:
		return "a device"
	}
	return "an irregular file"
}
