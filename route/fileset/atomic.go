package fileset

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"
)

// OutputFile is one file of a plan's output, rendered in memory before anything is written.
type OutputFile struct {
	Name string // file name inside the output folder
	Data []byte
}

// ErrOverwrite is wrapped by a writer's error when it refused to write because an output
// would replace one of the run's inputs: the same file, however it is reached (through a
// symbolic link to the folder, a hard link, another spelling of the path).
var ErrOverwrite = errors.New("an output would overwrite an input")

// ErrOutFolder is wrapped by WriteFiles' error when the output folder holds something that
// would not survive replacing the folder (a sub-folder, a device, a named pipe) or an
// output's name is taken by a folder.
var ErrOutFolder = errors.New("output folder cannot be replaced safely")

// OutputError is an output that could not be written for a reason outside the run's inputs:
// a full disk, a missing permission, an output folder that is a file.
type OutputError struct {
	Path string // the file or folder that was being written
	Err  error
}

func (e *OutputError) Error() string { return "cannot write " + e.Path + ": " + e.Err.Error() }
func (e *OutputError) Unwrap() error { return e.Err }

// outErr wraps err as the failure to write path, dropping the *fs.PathError or *os.LinkError
// around the system's error: those name a temporary file the user never sees.
func outErr(path string, err error) error { return &OutputError{Path: path, Err: cause(err)} }

func cause(err error) error {
	var pe *fs.PathError
	var le *os.LinkError
	switch {
	case errors.As(err, &pe):
		return pe.Err
	case errors.As(err, &le):
		return le.Err
	}
	return err
}

// WriteHook, when not nil, is called before each step of writing outputs ("write" a file,
// "link" a file kept from the old folder, "switch" folders, "remove" the old folder, "commit"
// a journal, "rename" a committed file)
// with the final path concerned; an error it returns fails the step as the system's error
// would. Only tests set it: to fail the Nth file as a full disk does, or to widen the window
// in which a killed run is caught half way.
var WriteHook func(step, path string) error

func hook(step, path string) error {
	if WriteHook == nil {
		return nil
	}
	return WriteHook(step, path)
}

// errNoExchange says the system cannot exchange two folders in one step.
var errNoExchange = errors.New("folder exchange not supported")

// exchange swaps two folders in one step; a variable so that tests take the portable path.
var exchange = exchangeFolders

// Names of the temporary things the writers leave only when killed; the next run removes
// those of processes no longer running. Each starts with ourPrefix.
const (
	ourPrefix   = ".spanwright-"
	stagePrefix = ourPrefix + "stage-" // CommitFiles' journal: .spanwright-stage-PID-RANDOM
	commitMark  = ".commit"            // in a journal folder: the set is whole, roll it forward
)

// WriteFiles replaces the outputs in dir with files, as one set: a reader sees either every
// old output or every new one, never a mix, even if the process is killed half way. The new
// set is written into a fresh hidden folder beside dir (.spanwright-NAME.new-PID-RANDOM, on
// the same file system), which is then exchanged with dir in one step (Linux renameat2
// RENAME_EXCHANGE; elsewhere, or on a file system without it, two renames, between which dir
// is briefly absent) and the old folder removed.
//
// Files and symbolic links in dir that are not outputs (the user's notes, the plan's inputs)
// are linked into the new folder before the exchange, so each keeps its inode and bytes. A
// sub-folder or a special file in dir cannot be kept that way: WriteFiles then refuses,
// writing nothing, with an error wrapping ErrOutFolder. It refuses likewise, wrapping
// ErrOverwrite, when an output would be one of the files in protect (the run's inputs),
// comparing file identity, not path text. dir may be reached through a symbolic link: the
// folder it points to is replaced. When dir is a mount point, its parent folder cannot be
// written, or it is the working folder (where the shell that started us most likely is: a
// replaced folder would leave that shell in the old one), the files are written into dir
// itself as CommitFiles does. Any other program whose working folder is dir keeps seeing the
// old folder, emptied, until it changes folder again.
//
// Leftovers of a killed run (its hidden folders beside dir) are removed, or restored when
// dir itself went missing, before anything is written. Failures to write (a full disk, a
// missing permission, dir naming a file) are *OutputError.
//
// When ctx is done before the new set is switched in, WriteFiles removes what it wrote and
// returns ctx's error: nothing is written.
func WriteFiles(ctx context.Context, dir string, files []OutputFile, protect []string) error {
	set, err := Begin(ctx, dir, outputNames(files), protect)
	if err != nil {
		return err
	}
	return set.putAll(files)
}

// outputNames lists the files' names in order.
func outputNames(files []OutputFile) []string {
	names := make([]string, len(files))
	for i, f := range files {
		names[i] = f.Name
	}
	return names
}

// putAll writes files in name order into the set and commits it.
func (s *Set) putAll(files []OutputFile) error {
	sorted := append([]OutputFile(nil), files...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].Name < sorted[j].Name })
	for _, f := range sorted {
		if err := s.Write(f.Name, func(w io.Writer) error {
			_, err := w.Write(f.Data)
			return err
		}); err != nil {
			return err
		}
	}
	return s.Commit()
}

// Begin starts a set of output files that will replace the outputs in dir as WriteFiles
// does; names are the files the set will hold, each to be given to Write once. Everything
// WriteFiles refuses before writing (an output that would replace an input, a folder in
// the way) Begin refuses, writing nothing. When it returns a Set, a hidden folder is there
// to write into: the caller writes each file with Write as soon as it is rendered, then
// Commit, and defers Abort for the paths that stop early.
func Begin(ctx context.Context, dir string, names []string, protect []string) (*Set, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	sorted, err := sortedNames(names)
	if err != nil {
		return nil, err
	}
	real, exists, err := resolveOut(dir)
	if err != nil {
		return nil, err
	}
	parent, base := filepath.Dir(real), filepath.Base(real)
	if parent == real {
		return BeginInPlace(ctx, real, names, protect)
	}
	recoverSiblings(parent, base, real)
	if _, err := os.Lstat(real); err == nil {
		exists = true // restored from a killed run's leftovers
	}
	if err := newGuard(protect).check(real, sorted); err != nil {
		return nil, err
	}
	mode := fs.FileMode(0o755)
	var keep []string
	var oldInfo fs.FileInfo
	if exists {
		info, err := os.Stat(real)
		if err != nil {
			return nil, outErr(real, err)
		}
		mode, oldInfo = info.Mode().Perm(), info
		if pinfo, err := os.Stat(parent); err != nil || !sameDevice(info, pinfo) {
			return BeginInPlace(ctx, real, names, protect)
		}
		if wd, err := os.Stat("."); err == nil && os.SameFile(wd, info) {
			// The shell that started us is most likely in dir: replacing the folder would
			// leave it in the old one, empty, and relative paths typed there would fail.
			return BeginInPlace(ctx, real, names, protect)
		}
		if err := RecoverFiles(real); err != nil {
			return nil, err
		}
		if keep, err = foreign(real, sorted); err != nil {
			return nil, err
		}
	}
	tmp, err := os.MkdirTemp(parent, siblingPrefix(base, "new"))
	if err != nil {
		if exists && errors.Is(err, fs.ErrPermission) {
			return BeginInPlace(ctx, real, names, protect)
		}
		return nil, outErr(real, err)
	}
	if err := os.Chmod(tmp, mode); err != nil {
		os.RemoveAll(tmp)
		return nil, outErr(real, err)
	}
	if oldInfo != nil {
		copyOwner(tmp, oldInfo)
	}
	return newSet(ctx, real, tmp, sorted, false, exists, keep), nil
}

// A Set is a set of output files being written as they are rendered: each goes to its
// temporary place as it is rendered (Write one at a time, or WriteParts several side by
// side), so that no file is ever held whole in memory, and Commit puts the whole set in
// place as one, as WriteFiles (a Set from Begin) or CommitFiles (from BeginInPlace) does.
// Until Commit, dir holds its old files only: a failed Write, Abort, a done context or a
// killed process leaves no new file in it (a killed one leaves its hidden folder, which the
// next run removes). A Set's methods are for one goroutine; WriteParts runs its renderers on
// goroutines of its own and returns when every one has ended.
type Set struct {
	ctx     context.Context
	real    string   // the output folder
	tmp     string   // where the files are written: a hidden sibling of real, or a journal in it
	names   []string // every file of the set, sorted
	inPlace bool     // CommitFiles' way: tmp is a journal folder in real
	exists  bool     // real existed: exchange the folders rather than rename
	keep    []string // entries of real that are not outputs, linked into tmp before the switch
	pending map[string]bool
	done    bool // committed or aborted
}

func newSet(ctx context.Context, real, tmp string, names []string, inPlace, exists bool, keep []string) *Set {
	pending := make(map[string]bool, len(names))
	for _, n := range names {
		pending[n] = true
	}
	return &Set{ctx: ctx, real: real, tmp: tmp, names: names, inPlace: inPlace, exists: exists, keep: keep, pending: pending}
}

// Write writes the file name of the set: render writes its bytes to the writer it is given
// (buffered; Write flushes it). Any error, render's own or the system's, aborts the set: an
// error writing the file is an *OutputError naming the file's final place; render's error
// is returned as it is (ctx's error when it stopped). When ctx is done before the file is
// begun, the set is aborted and ctx's error returned. A name not given to Begin, or given
// twice, is a caller's bug.
func (s *Set) Write(name string, render func(w io.Writer) error) error {
	if s.done {
		return fmt.Errorf("fileset: output %s written after the set was committed or aborted", name)
	}
	if err := s.claim(name); err != nil {
		s.Abort()
		return err
	}
	if err := s.ctx.Err(); err != nil {
		s.Abort()
		return err
	}
	if err := s.write(name, render); err != nil {
		s.Abort()
		return err
	}
	return nil
}

// claim marks name as written, refusing a name not given to Begin or given twice.
func (s *Set) claim(name string) error {
	if !s.pending[name] {
		return fmt.Errorf("fileset: output %s was not named when the set was begun, or is written twice", name)
	}
	delete(s.pending, name)
	return nil
}

// fileBuffer is the size of the buffer between a renderer and its file.
const fileBuffer = 64 << 10

func (s *Set) write(name string, render func(w io.Writer) error) error {
	path := filepath.Join(s.tmp, name)
	final := filepath.Join(s.real, name)
	if sub := filepath.Dir(path); sub != filepath.Clean(s.tmp) {
		if err := os.MkdirAll(sub, 0o755); err != nil {
			return outErr(filepath.Dir(final), err)
		}
	}
	if err := hook("write", final); err != nil {
		return outErr(final, err)
	}
	// No fsync: a rename already guarantees that a killed run leaves each set whole;
	// syncing every file of every sweep scenario costs milliseconds each.
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return outErr(final, err)
	}
	rec := &recorder{w: f}
	bw := bufio.NewWriterSize(rec, fileBuffer)
	err = render(bw)
	if err == nil {
		err = bw.Flush()
	}
	if cerr := f.Close(); err == nil && cerr != nil {
		rec.err = cerr
		err = cerr
	}
	switch {
	case rec.err != nil:
		return outErr(final, rec.err)
	case err != nil:
		return err
	}
	return nil
}

// recorder keeps the first error of the writer it wraps: an error the renderer returns may be
// the file's (a full disk) or its own.
type recorder struct {
	w   io.Writer
	err error
}

func (r *recorder) Write(p []byte) (int, error) {
	n, err := r.w.Write(p)
	if err != nil && r.err == nil {
		r.err = err
	}
	return n, err
}

// Commit puts the set in place (see WriteFiles and CommitFiles for how, and what a failure
// leaves). Every file named to Begin must have been written; when ctx is done before the
// switch, the set is aborted and ctx's error returned.
func (s *Set) Commit() error {
	if s.done {
		return errors.New("fileset: set committed after it was committed or aborted")
	}
	if len(s.pending) > 0 {
		missing := make([]string, 0, len(s.pending))
		for n := range s.pending {
			missing = append(missing, n)
		}
		sort.Strings(missing)
		s.Abort()
		return fmt.Errorf("fileset: outputs %s named but not written", strings.Join(missing, ", "))
	}
	if s.inPlace {
		return s.commitInPlace()
	}
	s.done = true
	fail := func(err error) error {
		os.RemoveAll(s.tmp)
		return err
	}
	for _, name := range s.keep {
		if err := keepEntry(s.real, s.tmp, name); err != nil {
			return fail(err)
		}
	}
	if err := s.ctx.Err(); err != nil {
		return fail(err)
	}
	if err := hook("switch", s.real); err != nil {
		return fail(outErr(s.real, err))
	}
	if !s.exists {
		if err := os.Rename(s.tmp, s.real); err != nil {
			return fail(outErr(s.real, err))
		}
		return nil
	}
	old, err := swap(s.tmp, s.real, filepath.Base(s.real))
	if err != nil {
		return fail(outErr(s.real, err))
	}
	return dropOld(old, s.real, s.names)
}

// Abort removes what the set wrote; dir is left as it was. It does nothing once the set is
// committed or aborted, so a caller may defer it.
func (s *Set) Abort() {
	if s.done {
		return
	}
	s.done = true
	os.RemoveAll(s.tmp)
}

// sortedNames returns the outputs' names sorted, refusing names that are not plain relative
// paths or that repeat: a caller's bug.
func sortedNames(names []string) ([]string, error) {
	sorted := slices.Clone(names)
	sort.Strings(sorted)
	for i, n := range sorted {
		if !filepath.IsLocal(n) || strings.HasPrefix(filepath.Base(n), ourPrefix) {
			return nil, fmt.Errorf("output name %q: want a file name inside the output folder", n)
		}
		if i > 0 && sorted[i-1] == n {
			return nil, fmt.Errorf("two outputs named %s", n)
		}
	}
	return sorted, nil
}

// topNames is the set of the first path elements of the outputs' names.
func topNames(names []string) map[string]bool {
	top := make(map[string]bool, len(names))
	for _, n := range names {
		top[strings.Split(filepath.ToSlash(n), "/")[0]] = true
	}
	return top
}

// resolveOut turns the output folder as given into the real path of the folder to replace
// (symbolic links followed), creating its parent folders, and says whether it exists.
func resolveOut(dir string) (real string, exists bool, err error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return "", false, outErr(dir, err)
	}
	if _, err := os.Lstat(abs); err == nil {
		real, err := filepath.EvalSymlinks(abs)
		if err != nil {
			return "", false, outErr(dir, err)
		}
		info, err := os.Stat(real)
		if err != nil {
			return "", false, outErr(dir, err)
		}
		if !info.IsDir() {
			return "", false, &OutputError{Path: dir, Err: errors.New("it is a file, not a folder")}
		}
		return real, true, nil
	}
	parent := filepath.Dir(abs)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return "", false, outErr(dir, err)
	}
	rp, err := filepath.EvalSymlinks(parent)
	if err != nil {
		return "", false, outErr(dir, err)
	}
	return filepath.Join(rp, filepath.Base(abs)), false, nil
}

// guard holds the identities of the files an output must never replace.
type guard []struct {
	path string
	info fs.FileInfo
}

func newGuard(protect []string) guard {
	var g guard
	for _, p := range protect {
		if info, err := os.Stat(p); err == nil {
			g = append(g, struct {
				path string
				info fs.FileInfo
			}{p, info})
		}
	}
	return g
}

// CheckOverwrite refuses, wrapping ErrOverwrite, when writing files into dir would replace
// one of the files in protect, as WriteFiles and CommitFiles would refuse when they came to
// write them: a caller that works long before it writes (a sweep) asks first.
// It touches nothing on disk: a folder that does not exist yet holds no input.
func CheckOverwrite(dir string, files []OutputFile, protect []string) error {
	real, err := filepath.EvalSymlinks(dir)
	if err != nil {
		return nil // not there yet (or not reachable: the writer will say so)
	}
	return newGuard(protect).check(real, outputNames(files))
}

// check refuses, wrapping ErrOverwrite, when an output in dir is one of the guarded files.
func (g guard) check(dir string, names []string) error {
	for _, n := range names {
		final := filepath.Join(dir, n)
		info, err := os.Stat(final)
		if err != nil {
			continue
		}
		for _, in := range g {
			if os.SameFile(info, in.info) {
				return fmt.Errorf("%w: %s is the input %s; choose another --out folder", ErrOverwrite, final, in.path)
			}
		}
	}
	return nil
}

// writeAll writes files into dir; errors name the file's final place in finalDir.
func writeAll(dir, finalDir string, files []OutputFile) error {
	for _, f := range files {
		name := filepath.Join(dir, f.Name)
		final := filepath.Join(finalDir, f.Name)
		if sub := filepath.Dir(name); sub != filepath.Clean(dir) {
			if err := os.MkdirAll(sub, 0o755); err != nil {
				return outErr(filepath.Dir(final), err)
			}
		}
		if err := hook("write", final); err != nil {
			return outErr(final, err)
		}
		// No fsync: a rename already guarantees that a killed run leaves each set whole;
		// syncing every file of every sweep scenario costs milliseconds each.
		if err := os.WriteFile(name, f.Data, 0o644); err != nil {
			return outErr(final, err)
		}
	}
	return nil
}

// foreign lists the entries of dir that are not outputs, to keep in the replacing folder, and
// refuses what cannot be kept by linking: folders and special files, and a folder in the way
// of an output file.
func foreign(dir string, names []string) ([]string, error) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil, outErr(dir, err)
	}
	top, sub := map[string]bool{}, map[string]bool{} // outputs' first path elements; those that are folders
	for _, n := range names {
		first, _, nested := strings.Cut(filepath.ToSlash(n), "/")
		top[first] = true
		sub[first] = sub[first] || nested
	}
	var keep []string
	for _, e := range ents {
		n, t := e.Name(), e.Type()
		switch {
		case top[n] && t.IsDir() && !sub[n]:
			return nil, fmt.Errorf("%w: %s is a folder where the output %s goes; move it or choose another --out folder", ErrOutFolder, filepath.Join(dir, n), n)
		case top[n]:
			continue
		case t.IsRegular() || t&fs.ModeSymlink != 0:
			keep = append(keep, n)
		case t.IsDir():
			return nil, fmt.Errorf("%w: %s holds the folder %s, which is not a spanwright output; the outputs replace the folder as one set, so give them a folder of their own (e.g. --out %s)",
				ErrOutFolder, dir, n, filepath.Join(dir, "plan-out"))
		default:
			return nil, fmt.Errorf("%w: %s holds %s (%s), which cannot be kept while the outputs replace the folder; give them a folder of their own", ErrOutFolder, dir, n, t.Type())
		}
	}
	return keep, nil
}

// keepEntry puts the entry name of dir into tmp as itself: a hard link to a file, a copy of a
// symbolic link.
func keepEntry(dir, tmp, name string) error {
	src, dst := filepath.Join(dir, name), filepath.Join(tmp, name)
	if err := hook("link", src); err != nil {
		return outErr(src, err)
	}
	info, err := os.Lstat(src)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil // removed meanwhile
		}
		return outErr(src, err)
	}
	if info.Mode()&fs.ModeSymlink != 0 {
		target, err := os.Readlink(src)
		if err == nil {
			err = os.Symlink(target, dst)
		}
		if err != nil {
			return keepErr(src, err)
		}
		return nil
	}
	if err := os.Link(src, dst); err != nil {
		return keepErr(src, err)
	}
	return nil
}

func keepErr(src string, err error) error {
	return &OutputError{Path: src, Err: fmt.Errorf("%w; it is not a spanwright output and must be kept beside the new outputs: give them a folder of their own", cause(err))}
}

// swap exchanges the folders tmp and real and returns where the old folder now is.
func swap(tmp, real, base string) (string, error) {
	err := exchange(tmp, real)
	if err == nil {
		return tmp, nil
	}
	if !errors.Is(err, errNoExchange) {
		return "", err
	}
	// Two renames: real is absent between them; a run killed there leaves the old folder
	// under its .old name, and the next run puts it back (recoverSiblings).
	rest := strings.TrimPrefix(filepath.Base(tmp), siblingPrefix(base, "new"))
	old := filepath.Join(filepath.Dir(tmp), siblingPrefix(base, "old")+rest)
	if err := os.Rename(real, old); err != nil {
		return "", err
	}
	if err := os.Rename(tmp, real); err != nil {
		os.Rename(old, real)
		return "", err
	}
	return old, nil
}

// dropOld removes the replaced folder old, first moving back into real any entry that
// appeared in old after foreign listed it (a file the user saved meanwhile).
func dropOld(old, real string, names []string) error {
	top := topNames(names)
	ents, err := os.ReadDir(old)
	if err != nil {
		// Files saved into the old folder during the switch cannot be listed: keep the folder
		// rather than remove what may be someone's work.
		kept := real + ".kept-" + strconv.Itoa(os.Getpid())
		if os.Rename(old, kept) == nil {
			old = kept
		}
		return outErr(old, fmt.Errorf("%w; the folder replaced is kept as %s", err, old))
	}
	for _, e := range ents {
		n := e.Name()
		if top[n] {
			continue
		}
		if _, err := os.Lstat(filepath.Join(real, n)); err == nil {
			continue
		}
		if err := os.Rename(filepath.Join(old, n), filepath.Join(real, n)); err != nil {
			kept := real + ".kept-" + strconv.Itoa(os.Getpid())
			if os.Rename(old, kept) == nil {
				old = kept
			}
			return outErr(filepath.Join(real, n), fmt.Errorf("%w; the folder replaced, with it, is kept as %s", err, old))
		}
	}
	if err := hook("remove", old); err != nil {
		return outErr(old, err)
	}
	// The new set is in place: a failure to remove the old folder is not the run's failure.
	// What is left is one of our hidden folders beside dir, which the next run removes once
	// this process is gone (recoverSiblings).
	_ = os.RemoveAll(old)
	return nil
}

// siblingPrefix starts the name of WriteFiles' hidden folders beside the output folder base:
// .spanwright-BASE.KIND-PID- followed by MkdirTemp's random digits.
func siblingPrefix(base, kind string) string {
	return ourPrefix + base + "." + kind + "-" + strconv.Itoa(os.Getpid()) + "-"
}

// deadRun parses name as PREFIX PID - DIGITS and reports whether it is the leftover of a
// process no longer running.
func deadRun(name, prefix string) bool {
	rest, ok := strings.CutPrefix(name, prefix)
	if !ok {
		return false
	}
	pid, rnd, ok := strings.Cut(rest, "-")
	n, err := strconv.Atoi(pid)
	if !ok || err != nil || n <= 0 || !digits(rnd) {
		return false
	}
	return n != os.Getpid() && !alive(n)
}

func digits(s string) bool {
	if s == "" {
		return false
	}
	for _, c := range s {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// recoverSiblings removes the hidden folders a killed WriteFiles left beside the output
// folder base in parent; when the output folder itself is missing (killed between the two
// renames of the portable switch), it puts the old one back instead. Best effort: what it
// cannot read or remove stays for a later run.
func recoverSiblings(parent, base, real string) {
	ents, err := os.ReadDir(parent)
	if err != nil {
		return
	}
	for _, e := range ents {
		n := e.Name()
		for _, kind := range []string{"old", "new"} {
			rest, ok := strings.CutPrefix(n, ourPrefix+base+"."+kind+"-")
			if !ok || !deadRun(rest, "") {
				continue
			}
			p := filepath.Join(parent, n)
			if _, err := os.Lstat(real); kind == "old" && errors.Is(err, fs.ErrNotExist) && os.Rename(p, real) == nil {
				continue
			}
			os.RemoveAll(p)
		}
	}
}

// CommitFiles writes files into dir, a folder that may hold other things (a sweep's scenario
// folders), so that they appear as one set to the next run at the latest: they are written
// into a journal folder in dir (.spanwright-stage-PID-RANDOM), marked whole by an empty
// .commit file, then renamed into place one by one. A full disk or any other failure before
// the mark leaves none of the new files and every old one. A run killed after the mark
// leaves some old and some new files until the next CommitFiles or RecoverFiles on dir,
// which finishes the renames (rolls the journal forward); that window, between a kill and
// the next run, is the one a reader can see a mix in. An output that would replace one of
// the files in protect is refused, wrapping ErrOverwrite. When ctx is done before the mark,
// nothing new is left and ctx's error is returned.
func CommitFiles(ctx context.Context, dir string, files []OutputFile, protect []string) error {
	set, err := BeginInPlace(ctx, dir, outputNames(files), protect)
	if err != nil {
		return err
	}
	return set.putAll(files)
}

// BeginInPlace starts a set of output files that Commit puts into dir as CommitFiles does;
// names, Write, Commit and Abort are as for Begin.
func BeginInPlace(ctx context.Context, dir string, names []string, protect []string) (*Set, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	sorted, err := sortedNames(names)
	if err != nil {
		return nil, err
	}
	if info, err := os.Stat(dir); err == nil && !info.IsDir() {
		return nil, &OutputError{Path: dir, Err: errors.New("it is a file, not a folder")}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, outErr(dir, err)
	}
	if err := RecoverFiles(dir); err != nil {
		return nil, err
	}
	if err := newGuard(protect).check(dir, sorted); err != nil {
		return nil, err
	}
	for _, n := range sorted {
		if info, err := os.Lstat(filepath.Join(dir, n)); err == nil && info.IsDir() {
			return nil, fmt.Errorf("%w: %s is a folder where the output %s goes; move it or choose another --out folder", ErrOutFolder, filepath.Join(dir, n), n)
		}
	}
	stage, err := os.MkdirTemp(dir, stagePrefix+strconv.Itoa(os.Getpid())+"-")
	if err != nil {
		return nil, outErr(dir, err)
	}
	return newSet(ctx, dir, stage, sorted, true, true, nil), nil
}

// commitInPlace marks the journal whole and rolls it forward (CommitFiles).
func (s *Set) commitInPlace() error {
	s.done = true
	dir, stage := s.real, s.tmp
	if err := s.ctx.Err(); err != nil {
		os.RemoveAll(stage)
		return err
	}
	if err := hook("commit", dir); err != nil {
		os.RemoveAll(stage)
		return outErr(dir, err)
	}
	mark, err := os.OpenFile(filepath.Join(stage, commitMark), os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err == nil {
		err = mark.Close()
	}
	if err != nil {
		os.RemoveAll(stage)
		return outErr(dir, err)
	}
	if err := rollForward(dir, stage); err != nil {
		return fmt.Errorf("%w (the new outputs are complete in %s; the next run puts them in place)", err, stage)
	}
	os.RemoveAll(stage)
	return nil
}

// RecoverFiles finishes or removes what a killed CommitFiles left in dir: a journal marked
// whole is rolled forward (its files renamed into place), an unmarked one removed; and
// temporary files of older versions (.NAME.tmp-PID-SEQ) are removed. Journals of running
// processes are left alone. A missing dir has nothing to recover.
func RecoverFiles(dir string) error {
	ents, err := os.ReadDir(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return outErr(dir, err)
	}
	for _, e := range ents {
		n := e.Name()
		p := filepath.Join(dir, n)
		if e.IsDir() && deadRun(n, stagePrefix) {
			if _, err := os.Stat(filepath.Join(p, commitMark)); err == nil {
				if err := rollForward(dir, p); err != nil {
					return err
				}
			}
			if err := os.RemoveAll(p); err != nil {
				return outErr(p, err)
			}
			continue
		}
		// WriteFiles of earlier versions wrote each file to .NAME.tmp-PID-SEQ in place.
		if i := strings.LastIndex(n, ".tmp-"); e.Type().IsRegular() && strings.HasPrefix(n, ".") && i > 1 && deadRun(n[i:], ".tmp-") {
			os.Remove(p)
		}
	}
	return nil
}

// rollForward renames every file of the journal folder stage (but its mark) into dir, in
// name order; a file already moved by an earlier, killed roll is skipped.
func rollForward(dir, stage string) error {
	var rel []string
	err := filepath.WalkDir(stage, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() && p != filepath.Join(stage, commitMark) {
			r, err := filepath.Rel(stage, p)
			if err != nil {
				return err
			}
			rel = append(rel, r)
		}
		return nil
	})
	if err != nil {
		return outErr(dir, err)
	}
	sort.Strings(rel)
	for _, r := range rel {
		final := filepath.Join(dir, r)
		if sub := filepath.Dir(final); sub != filepath.Clean(dir) {
			if err := os.MkdirAll(sub, 0o755); err != nil {
				return outErr(sub, err)
			}
		}
		if err := hook("rename", final); err != nil {
			return outErr(final, err)
		}
		if err := os.Rename(filepath.Join(stage, r), final); err != nil && !errors.Is(err, fs.ErrNotExist) {
			return outErr(final, err)
		}
	}
	return nil
}

// WriteFresh writes files into dir, a new folder no one else sees until the caller renames it
// into place (as a sweep publishes a scenario folder): the folder's rename is what makes the
// set appear whole, so the files go straight to their names.
func WriteFresh(dir string, files []OutputFile) error {
	if _, err := sortedNames(outputNames(files)); err != nil {
		return err
	}
	sorted := append([]OutputFile(nil), files...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].Name < sorted[j].Name })
	return writeAll(dir, dir, sorted)
}
