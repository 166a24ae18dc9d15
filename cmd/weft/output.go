package main

import (
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// Outputs are written so that a user's files are never lost:
//
//   - every output goes to a temporary sibling (".NAME.weft-tmp-…") and is
//     renamed into place only when it is complete;
//   - a lock file ".NAME.weft-lock" beside the output makes a second weft
//     run writing the same path fail at once instead of replacing the
//     first one's result; the state of the path is checked again just
//     before the final rename;
//   - without --force nothing existing is replaced; with --force a file is
//     replaced only when it is a regular file, and a folder only when weft
//     wrote it (its marker file lists every file in it) and it holds
//     nothing else;
//   - files and folders are created with the permissions the umask allows;
//   - problems with an output path are found before the work starts and
//     reported as bad input, naming the path the user gave.

// markerName is the file weft writes into every output folder; it lists
// the folder's files, which is how --force recognises a folder weft wrote.
const markerName = ".weft-output"

// markerHead is the marker's first lines; the file names follow, one a line.
const markerHead = "# Written by weft. 'weft fit --force' replaces this folder only while it\n" +
	"# holds nothing beyond the files listed below; add nothing you want to keep.\n"

// Suffixes of weft's own hidden helper files beside or inside an output.
const (
	tmpTag  = ".weft-tmp-"
	oldTag  = ".weft-old-"
	lockTag = ".weft-lock"
)

// legacyNames are the files weft writes at the top of an output folder. A
// folder without a marker (written before weft wrote markers) is
// recognised by its model card and may hold only these and plots.
var legacyNames = map[string]bool{"model.json": true, "fit.csv": true, "selection.csv": true,
	"heldout.csv": true, "report.html": true, "curves.csv": true, "raw.csv": true}

// ioErrText is the operating system's reason without the path, so that
// messages can name the path the user gave instead of a temporary one.
func ioErrText(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err.Error()
	}
	return err.Error()
}

// randomTag returns a short random hex string for temporary names.
func randomTag() string {
	var b [6]byte
	_, _ = rand.Read(b[:])
	return hex.EncodeToString(b[:])
}

// isWeftHelper reports whether a name is one of weft's hidden temporary,
// old-copy or lock files (left behind only by a killed run).
func isWeftHelper(name string) bool {
	return strings.HasPrefix(name, ".") && (strings.Contains(name, tmpTag) || strings.Contains(name, oldTag) || strings.HasSuffix(name, lockTag))
}

// kindOf names what a non-regular file is, for messages.
func kindOf(m fs.FileMode) string {
	switch {
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsDir():
		return "a folder"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m.IsRegular():
		return "a file"
	}
	return "not a regular file"
}

// outputLock is an exclusive lock on one output path, held from the checks
// before the work until the output is in place.
type outputLock struct {
	path string
	f    *os.File
}

// errBusy says that another weft run holds the lock.
var errBusy = errors.New("busy")

// lockOutput locks the output path target through the lock file
// ".NAME.weft-lock" in its folder.
func lockOutput(target string) (*outputLock, error) {
	dir, base := filepath.Dir(target), filepath.Base(target)
	path := filepath.Join(dir, "."+base+lockTag)
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	for attempt := 0; attempt < 5; attempt++ {
		flags := os.O_RDWR | os.O_CREATE
		if !lockIsExclusive {
			flags |= os.O_EXCL
		}
		f, err := os.OpenFile(path, flags, 0o666)
		if errors.Is(err, fs.ErrExist) {
			return nil, errBusy
		}
		if err != nil {
			return nil, err
		}
		busy, err := lockFile(f)
		if busy || err != nil {
			f.Close()
			if busy {
				return nil, errBusy
			}
			return nil, err
		}
		// The previous holder may have removed the file between our open
		// and our lock; then the lock is on a file nobody else will see.
		st1, err1 := f.Stat()
		st2, err2 := os.Stat(path)
		if err1 == nil && err2 == nil && os.SameFile(st1, st2) {
			cleanup.locks[path] = true
			return &outputLock{path: path, f: f}, nil
		}
		f.Close()
	}
	return nil, errBusy
}

// release removes the lock file and drops the lock.
func (l *outputLock) release() {
	if l == nil {
		return
	}
	cleanup.mu.Lock()
	os.Remove(l.path)
	delete(cleanup.locks, l.path)
	cleanup.mu.Unlock()
	l.f.Close()
}

// lockError turns a failure to lock target into a message for the user.
func lockError(target string, err error) error {
	if errors.Is(err, errBusy) {
		hint := "wait for it to finish"
		if !lockIsExclusive {
			hint += fmt.Sprintf(" (if no weft is running, delete %s)", filepath.Join(filepath.Dir(target), "."+filepath.Base(target)+lockTag))
		}
		return badInputf("%s is being written by another weft run; %s or choose another output", target, hint)
	}
	return badInputf("cannot write in %s (%s); check that the folder exists and is writable", filepath.Dir(target), ioErrText(err))
}

// checkParent makes sure the folder that will hold target exists.
func checkParent(target string) error {
	parent := filepath.Dir(target)
	st, err := os.Stat(parent)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return badInputf("cannot create %s: the folder %s does not exist; create it first or choose another output", target, parent)
	case err != nil:
		return badInputf("cannot create %s (%s)", target, ioErrText(err))
	case !st.IsDir():
		return badInputf("cannot create %s: %s is not a folder", target, parent)
	}
	return nil
}

// ensureFolder creates the folder dir when it does not exist (its parent
// must); an existing non-folder is bad input.
func ensureFolder(dir string) error {
	st, err := os.Stat(dir)
	switch {
	case err == nil && st.IsDir():
		return nil
	case err == nil:
		return badInputf("%s exists and is %s, not a folder", dir, kindOf(st.Mode()))
	case !errors.Is(err, fs.ErrNotExist):
		return badInputf("cannot use %s (%s)", dir, ioErrText(err))
	}
	if err := checkParent(filepath.Clean(dir)); err != nil {
		return err
	}
	if err := os.Mkdir(dir, 0o777); err != nil && !errors.Is(err, fs.ErrExist) {
		return badInputf("cannot create %s (%s)", dir, ioErrText(err))
	}
	return nil
}

// removeStale removes temporary and old copies of target left behind by a
// killed run. The caller holds target's lock, so no live run owns them.
func removeStale(target string) {
	dir, base := filepath.Dir(target), filepath.Base(target)
	for _, tag := range []string{tmpTag, oldTag} {
		matches, _ := filepath.Glob(filepath.Join(dir, "."+escapeGlob(base)+tag+"*"))
		for _, m := range matches {
			os.RemoveAll(m)
		}
	}
}

func escapeGlob(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `*`, `\*`, `?`, `\?`, `[`, `\[`)
	return r.Replace(s)
}

// createTemp creates an empty temporary file beside target with the mode
// the umask allows (0644 under umask 022) and records it for cleanup.
func createTemp(target string) (*os.File, error) {
	dir, base := filepath.Dir(target), filepath.Base(target)
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	for {
		name := filepath.Join(dir, "."+base+tmpTag+randomTag())
		f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o666)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		if err == nil {
			trackTemp(name)
		}
		return f, err
	}
}

// writeNewFile writes data to a new file (it must not exist) with the mode
// the umask allows.
func writeNewFile(path string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o666)
	if err != nil {
		return err
	}
	_, werr := f.Write(data)
	return errors.Join(werr, f.Close())
}

// outputFile is one output file being written: checked and locked by
// prepareOutputFile, written by commit, released by close.
type outputFile struct {
	final   string
	force   bool
	existed bool
	lock    *outputLock
}

// prepareOutputFile checks, before any work, that path can be written:
// its folder exists and is writable, and it does not exist (or, with force,
// is a regular file). locked is true when the caller already holds a lock
// covering path (a file inside an output folder it locked).
func prepareOutputFile(path string, force, locked bool) (*outputFile, error) {
	o := &outputFile{final: filepath.Clean(path), force: force}
	if err := checkParent(o.final); err != nil {
		return nil, err
	}
	if !locked {
		l, err := lockOutput(o.final)
		if err != nil {
			return nil, lockError(o.final, err)
		}
		o.lock = l
	}
	if err := o.check(); err != nil {
		o.close()
		return nil, badInput(err)
	}
	return o, nil
}

// check looks at what is at the path now.
func (o *outputFile) check() error {
	st, err := os.Lstat(o.final)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		o.existed = false
		return nil
	case err != nil:
		return fmt.Errorf("cannot use %s (%s)", o.final, ioErrText(err))
	case !o.force:
		return fmt.Errorf("%s exists; pass --force to replace it or choose another output", o.final)
	case !st.Mode().IsRegular():
		return fmt.Errorf("%s exists and is %s; weft replaces only regular files — choose another output (or write to standard output and redirect it)", o.final, kindOf(st.Mode()))
	}
	o.existed = true
	return nil
}

// commit writes data through a temporary file and puts it in place. A file
// that appeared at the path since prepareOutputFile is not replaced.
func (o *outputFile) commit(data []byte) error {
	f, err := createTemp(o.final)
	if err != nil {
		return fmt.Errorf("cannot write %s (%s)", o.final, ioErrText(err))
	}
	tmp := f.Name()
	defer func() {
		os.Remove(tmp)
		untrackTemp(tmp)
	}()
	_, werr := f.Write(data)
	if err := errors.Join(werr, f.Close()); err != nil {
		return fmt.Errorf("cannot write %s (%s)", o.final, ioErrText(err))
	}
	existed := o.existed
	if err := o.check(); err != nil || o.existed != existed {
		if err == nil {
			err = fmt.Errorf("%s appeared while weft was running", o.final)
		}
		return fmt.Errorf("%v; it was not replaced", err)
	}
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	if !existed {
		// A hard link never replaces: if something appeared at the path in
		// the last instant, it is kept.
		err := os.Link(tmp, o.final)
		if errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("%s appeared while weft was running; it was not replaced", o.final)
		}
		if err == nil {
			return nil
		}
		// File systems without hard links: the check above must do.
	}
	if err := os.Rename(tmp, o.final); err != nil {
		return fmt.Errorf("cannot write %s (%s)", o.final, ioErrText(err))
	}
	return nil
}

// close releases the lock; it may be called more than once.
func (o *outputFile) close() {
	if o != nil {
		o.lock.release()
		o.lock = nil
	}
}

// writeOutputFile is prepareOutputFile and commit in one, for outputs that
// cost nothing to compute.
func writeOutputFile(path string, data []byte, force bool) error {
	o, err := prepareOutputFile(path, force, false)
	if err != nil {
		return err
	}
	defer o.close()
	return o.commit(data)
}

// outputDir is an output folder being written: files go into a temporary
// sibling folder, and commit moves the finished folder into place, so an
// interrupted run leaves either the old folder or the new one, never a
// mixture.
type outputDir struct {
	final   string
	tmp     string
	existed bool
	inputs  []string
	lock    *outputLock
	files   []string // written so far, slash-separated, relative
}

// prepareOutputDir checks, before any work, that the folder dir can be
// written: its parent exists and is writable, nobody else is writing it,
// and it does not exist — or, with force, is a folder weft wrote that
// holds nothing else and contains none of inputs. It then creates the
// temporary folder.
func prepareOutputDir(dir string, force bool, inputs []string) (*outputDir, error) {
	o := &outputDir{final: filepath.Clean(dir), inputs: inputs}
	if b := filepath.Base(o.final); b == "." || b == ".." || b == string(filepath.Separator) {
		return nil, badInputf("%s names an existing folder that weft cannot replace as a whole; give a new folder name", dir)
	}
	if err := checkParent(o.final); err != nil {
		return nil, err
	}
	l, err := lockOutput(o.final)
	if err != nil {
		return nil, lockError(o.final, err)
	}
	o.lock = l
	if err := o.check(force); err != nil {
		o.close()
		return nil, badInput(err)
	}
	removeStale(o.final)
	cleanup.mu.Lock()
	o.tmp = filepath.Join(filepath.Dir(o.final), "."+filepath.Base(o.final)+tmpTag+randomTag())
	err = os.Mkdir(o.tmp, 0o777)
	if err == nil {
		trackTemp(o.tmp)
	}
	cleanup.mu.Unlock()
	if err != nil {
		o.tmp = ""
		o.close()
		return nil, badInputf("cannot write in %s (%s); check that the folder is writable", filepath.Dir(o.final), ioErrText(err))
	}
	return o, nil
}

// check looks at what is at the folder's path now.
func (o *outputDir) check(force bool) error {
	st, err := os.Lstat(o.final)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		o.existed = false
		return nil
	case err != nil:
		return fmt.Errorf("cannot use %s (%s)", o.final, ioErrText(err))
	case !force:
		return fmt.Errorf("%s exists; pass --force to replace it (only a folder weft wrote is replaced) or choose another folder with -o", o.final)
	}
	if err := replaceable(o.final, st.Mode(), o.inputs); err != nil {
		return err
	}
	o.existed = true
	return nil
}

// replaceable says why --force may not replace the folder dir, or nil.
func replaceable(dir string, mode fs.FileMode, inputs []string) error {
	why := " — choose another folder with -o"
	if !mode.IsDir() || mode&fs.ModeSymlink != 0 {
		return fmt.Errorf("%s exists and is %s, not an output folder of weft; --force replaces only folders weft wrote%s", dir, kindOf(mode), why)
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		return err
	}
	if wd, err := os.Getwd(); err == nil && within(wd, abs) {
		return fmt.Errorf("%s is the current folder or contains it; weft does not replace the folder it runs in%s", dir, why)
	}
	for _, in := range inputs {
		if a, err := filepath.Abs(in); err == nil && within(a, abs) {
			return fmt.Errorf("the input %s lies inside %s; replacing the folder would delete it%s", in, dir, why)
		}
	}
	listed, hasMarker, err := readMarker(dir)
	if err != nil {
		return err
	}
	if !hasMarker && !legacyOutput(dir) {
		return fmt.Errorf("%s was not written by weft (it has no %s file listing weft's files); --force replaces only folders weft wrote%s", dir, markerName, why)
	}
	foreign := foreignEntries(dir, listed, hasMarker)
	if len(foreign) > 0 {
		return fmt.Errorf("%s holds files weft did not write (%s); replacing the folder would delete them, so it is kept — move them elsewhere or choose another folder with -o", dir, strings.Join(foreign, ", "))
	}
	return nil
}

// within reports whether path p is dir or lies inside it (both absolute).
func within(p, dir string) bool {
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

// readMarker returns the files listed in dir's marker.
func readMarker(dir string) (map[string]bool, bool, error) {
	p := filepath.Join(dir, markerName)
	st, err := os.Lstat(p)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, false, nil
	}
	if err != nil {
		return nil, false, fmt.Errorf("cannot read %s (%s)", p, ioErrText(err))
	}
	if !st.Mode().IsRegular() || st.Size() > 1<<20 {
		return nil, false, nil
	}
	b, err := os.ReadFile(p)
	if err != nil {
		return nil, false, fmt.Errorf("cannot read %s (%s)", p, ioErrText(err))
	}
	listed := map[string]bool{}
	for _, ln := range strings.Split(string(b), "\n") {
		if ln != "" && !strings.HasPrefix(ln, "#") {
			listed[ln] = true
		}
	}
	return listed, true, nil
}

// legacyOutput recognises an output folder written before markers existed:
// it holds a weft model card.
func legacyOutput(dir string) bool {
	f, err := os.Open(filepath.Join(dir, "model.json"))
	if err != nil {
		return false
	}
	defer f.Close()
	var head struct {
		Format string `json:"format"`
	}
	if json.NewDecoder(io.LimitReader(f, 64<<20)).Decode(&head) != nil {
		return false
	}
	return strings.HasPrefix(head.Format, "weft.model/")
}

// foreignEntries lists (up to five) entries of dir that weft did not
// write: not in the marker's list (or, for a folder without a marker, not
// one of the names weft used to write), not weft's helper files, and any
// entry that is not a regular file or folder.
func foreignEntries(dir string, listed map[string]bool, hasMarker bool) []string {
	var out []string
	_ = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			out = append(out, filepath.Base(p)+" (unreadable)")
			return fs.SkipAll
		}
		if p == dir {
			return nil
		}
		rel, _ := filepath.Rel(dir, p)
		rel = filepath.ToSlash(rel)
		name := d.Name()
		switch {
		case isWeftHelper(name):
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		case d.IsDir() && rel == "plots" || d.IsDir() && hasMarker && listedPrefix(listed, rel+"/"):
			return nil
		case d.Type().IsRegular() && (rel == markerName && hasMarker || listed[rel] ||
			!hasMarker && (legacyNames[rel] || legacyPlot(rel))):
			return nil
		}
		if d.IsDir() {
			rel += "/"
		}
		out = append(out, rel)
		if len(out) >= 5 {
			return fs.SkipAll
		}
		if d.IsDir() {
			return fs.SkipDir
		}
		return nil
	})
	return out
}

func listedPrefix(listed map[string]bool, prefix string) bool {
	for k := range listed {
		if strings.HasPrefix(k, prefix) {
			return true
		}
	}
	return false
}

// legacyPlot reports whether rel is a plot as weft writes them.
func legacyPlot(rel string) bool {
	name, ok := strings.CutPrefix(rel, "plots/")
	return ok && !strings.Contains(name, "/") && (strings.HasSuffix(name, ".svg") || strings.HasSuffix(name, ".png"))
}

// folderSink is where the files of one output folder go: an outputDir, or
// a folder inside one (subFolder).
type folderSink interface {
	// write writes one file, rel relative to the folder.
	write(rel string, data []byte) error
	// dirs returns where the files written so far can be read back and
	// the folder's name as the user will see it.
	dirs() (tmp, final string)
}

// dirs implements folderSink.
func (o *outputDir) dirs() (string, string) { return o.tmp, o.final }

// subFolder is the folder rel inside an output folder being written.
type subFolder struct {
	od  *outputDir
	rel string
}

// write implements folderSink.
func (s subFolder) write(rel string, data []byte) error {
	return s.od.write(filepath.Join(s.rel, rel), data)
}

// dirs implements folderSink.
func (s subFolder) dirs() (string, string) {
	return filepath.Join(s.od.tmp, s.rel), filepath.Join(s.od.final, s.rel)
}

// files lists the files written into the subfolder so far, relative to it.
func (s subFolder) files() []string {
	prefix := filepath.ToSlash(s.rel) + "/"
	var out []string
	for _, f := range s.od.files {
		if r, ok := strings.CutPrefix(f, prefix); ok {
			out = append(out, r)
		}
	}
	return out
}

// path returns where a file named rel is written before commit.
func (o *outputDir) path(rel string) string { return filepath.Join(o.tmp, rel) }

// write writes one file of the folder (rel may name subfolders, e.g.
// plots/x.svg). Errors name the final path, not the temporary one.
func (o *outputDir) write(rel string, data []byte) error {
	p := o.path(rel)
	if d := filepath.Dir(p); d != o.tmp {
		if err := mkdirsBelow(o.tmp, d); err != nil {
			return fmt.Errorf("cannot write %s (%s)", filepath.Join(o.final, rel), ioErrText(err))
		}
	}
	if err := writeNewFile(p, data); err != nil {
		return fmt.Errorf("cannot write %s (%s)", filepath.Join(o.final, rel), ioErrText(err))
	}
	o.files = append(o.files, filepath.ToSlash(rel))
	return nil
}

// mkdirsBelow creates the folders from root (which must exist) down to
// dir, one level at a time and never with MkdirAll: if an interruption
// removed the temporary folder root, nothing recreates it.
func mkdirsBelow(root, dir string) error {
	rel, err := filepath.Rel(root, dir)
	if err != nil {
		return err
	}
	cur := root
	for _, part := range strings.Split(rel, string(filepath.Separator)) {
		cur = filepath.Join(cur, part)
		if err := os.Mkdir(cur, 0o777); err != nil && !errors.Is(err, fs.ErrExist) {
			return err
		}
	}
	return nil
}

// markerBytes is the marker listing files (sorted, so the same outputs
// give the same bytes).
func markerBytes(files []string) []byte {
	fs := append([]string(nil), files...)
	sort.Strings(fs)
	var b strings.Builder
	b.WriteString(markerHead)
	for i, f := range fs {
		if f == markerName || i > 0 && f == fs[i-1] {
			continue
		}
		b.WriteString(f + "\n")
	}
	return []byte(b.String())
}

// commit writes the marker and moves the finished folder into place,
// replacing the old one only if it still may be replaced.
func (o *outputDir) commit(force bool) error {
	if err := writeNewFile(o.path(markerName), markerBytes(o.files)); err != nil {
		return fmt.Errorf("cannot write %s (%s)", filepath.Join(o.final, markerName), ioErrText(err))
	}
	existed := o.existed
	if err := o.check(force); err != nil || o.existed != existed {
		if err == nil {
			err = fmt.Errorf("%s appeared while weft was running", o.final)
		}
		return fmt.Errorf("%v; it was not replaced and the new results were not written", err)
	}
	cleanup.mu.Lock()
	old := ""
	if existed {
		old = filepath.Join(filepath.Dir(o.final), "."+filepath.Base(o.final)+oldTag+randomTag())
		if err := os.Rename(o.final, old); err != nil {
			cleanup.mu.Unlock()
			return fmt.Errorf("cannot replace %s (%s)", o.final, ioErrText(err))
		}
		trackTemp(old)
	}
	// Without an old folder the rename fails if a non-empty folder appeared
	// in the last instant, which is then kept.
	if err := os.Rename(o.tmp, o.final); err != nil {
		if old != "" && os.Rename(old, o.final) == nil {
			delete(cleanup.temps, old)
		}
		cleanup.mu.Unlock()
		return fmt.Errorf("cannot write %s (%s)", o.final, ioErrText(err))
	}
	delete(cleanup.temps, o.tmp)
	o.tmp = ""
	cleanup.mu.Unlock()
	if old != "" {
		os.RemoveAll(old)
		untrackTemp(old)
	}
	return nil
}

// close removes the temporary folder if it was not committed and releases
// the lock; it may be called more than once.
func (o *outputDir) close() {
	if o == nil {
		return
	}
	if o.tmp != "" {
		os.RemoveAll(o.tmp)
		untrackTemp(o.tmp)
		o.tmp = ""
	}
	o.lock.release()
	o.lock = nil
}

// errTooLarge says that a file holds more than the bytes allowed.
var errTooLarge = errors.New("too large")

// readAtMost reads the file at path whole unless it holds more than max
// bytes (errTooLarge), so a huge file or a device cannot exhaust memory.
func readAtMost(path string, max int64) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, max+1))
	if err != nil {
		return nil, err
	}
	if int64(len(b)) > max {
		return nil, errTooLarge
	}
	return b, nil
}

// resultOutput is where a command's one result goes: standard output, or
// a file (-o FILE) checked before the work starts.
type resultOutput struct {
	stdout io.Writer
	file   *outputFile
}

// openResult checks the output named by -o (none or "-": standard output).
func openResult(stdout io.Writer, out string, force bool) (*resultOutput, error) {
	r := &resultOutput{stdout: stdout}
	if out == "" || out == "-" {
		return r, nil
	}
	f, err := prepareOutputFile(out, force, false)
	if err != nil {
		return nil, err
	}
	r.file = f
	return r, nil
}

// write writes the result.
func (r *resultOutput) write(data []byte) error {
	if r.file == nil {
		_, err := r.stdout.Write(data)
		return err
	}
	return r.file.commit(data)
}

// close releases the output file's lock.
func (r *resultOutput) close() {
	if r != nil {
		r.file.close()
	}
}

// writeJSON writes v as indented JSON with a trailing newline, without
// HTML escaping (model text such as "<" stays readable).
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
