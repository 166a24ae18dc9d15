package biaxial

import (
	"archive/zip"
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"
)

// ReadRecordFile reads a test file (CSV, or xlsx by its .xlsx extension or
// content) into a Record without selecting cycles. Of opt only Sheet and
// Limits are used.
func ReadRecordFile(path string, opt Options) (*Record, error) {
	rec, _, err := readFile(path, opt, false)
	return rec, err
}

// ReadRecord reads a test file from r into a Record without selecting
// cycles. name is used in messages and to tell xlsx from CSV (by the .xlsx
// extension, or by the zip signature of the content). Of opt only Sheet and
// Limits are used.
func ReadRecord(r io.Reader, name string, opt Options) (*Record, error) {
	rec, _, err := readStream(r, name, opt, false, "input")
	return rec, err
}

// ReadFile reads a test file and prepares it with opt, as ReadRecordFile
// followed by Prepare would. CSV text is read line by line, and the rows
// are kept in a compact form until the protocols are prepared, so memory
// grows with the rows of the file but not with its size in bytes.
func ReadFile(path string, opt Options) (*Specimen, error) {
	rows, err := ReadRows(path, opt)
	if err != nil {
		return nil, err
	}
	return prepare(rows.rec, rows.t, opt)
}

// Rows is one reading of a test file, its rows held in the compact form
// ReadFile keeps until it prepares the protocols, ready to be prepared
// with different Options (the cycles fitted, and every cycle for a view
// of the whole record) without reading and parsing the file again.
// Prepare may be called from several goroutines at once.
type Rows struct {
	rec *Record
	t   *rawTable
}

// ReadRows reads a test file as ReadFile does, checking opt the same way,
// without preparing it: of opt the reading uses only Sheet and Limits.
func ReadRows(path string, opt Options) (*Rows, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	rec, t, err := readFile(path, opt, true)
	if err != nil {
		return nil, err
	}
	return &Rows{rec: rec, t: t}, nil
}

// Prepare groups, selects and weighs the rows with opt, as
// ReadFile(path, opt) would have from the same bytes; the rows are not
// changed.
func (r *Rows) Prepare(opt Options) (*Specimen, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	return prepare(r.rec, r.t, opt)
}

// ProtocolLabels returns the labels of the file's protocols in the order
// they first appear.
func (r *Rows) ProtocolLabels() []string {
	labels := make([]string, len(r.t.groups))
	for i, g := range r.t.groups {
		labels[i] = g.label
	}
	return labels
}

// Read reads a test file from r and prepares it with opt, as ReadRecord
// followed by Prepare would (see ReadFile for the memory it takes). name
// is used in messages and to recognise xlsx.
func Read(r io.Reader, name string, opt Options) (*Specimen, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	rec, t, err := readStream(r, name, opt, true, "input")
	if err != nil {
		return nil, err
	}
	return prepare(rec, t, opt)
}

// Digest identifies the bytes a test file was read from: how many and their
// SHA-256 (lower-case hexadecimal), computed from the very bytes parsed, so
// that a record of the input describes the data used even if the file
// changes afterwards.
type Digest struct {
	Bytes  int64
	SHA256 string
}

// digestWriter counts and hashes what is written to it.
type digestWriter struct {
	h hash.Hash
	n int64
}

func newDigestWriter() *digestWriter { return &digestWriter{h: sha256.New()} }

func (w *digestWriter) Write(p []byte) (int, error) {
	w.n += int64(len(p))
	return w.h.Write(p)
}

func (w *digestWriter) digest() Digest {
	return Digest{Bytes: w.n, SHA256: hex.EncodeToString(w.h.Sum(nil))}
}

// digestOf reads r to its end and returns the digest of what it read.
func digestOf(r io.Reader) (Digest, error) {
	dw := newDigestWriter()
	if _, err := io.Copy(dw, r); err != nil {
		return Digest{}, err
	}
	return dw.digest(), nil
}

// FileDigest returns the digest of a file's contents, read as a stream:
// for files recorded beside test files (a cohort's group file); a test
// file's own digest comes with its Record or Specimen.
func FileDigest(path string) (Digest, error) {
	f, err := os.Open(path)
	if err != nil {
		return Digest{}, err
	}
	defer f.Close()
	return digestOf(f)
}

// readFile opens path and reads it. A workbook in a regular file is read
// through the file itself, without a copy of it in memory first (and is
// read once more, in sequence, for its digest).
func readFile(path string, opt Options, intoTable bool) (*Record, *rawTable, error) {
	lim := opt.Limits.withDefaults()
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, &ParseError{File: path, Err: err, Msg: "cannot read the file (" + errText(err) + ")",
			Fix: "check the path and permissions"}
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil || !st.Mode().IsRegular() {
		return readStream(f, path, opt, intoTable, "file")
	}
	if st.Size() > lim.MaxBytes {
		return nil, nil, tooLarge(path, lim.MaxBytes)
	}
	head := make([]byte, 4)
	n, _ := f.ReadAt(head, 0)
	if !isXLSX(path, head[:n]) {
		return readStream(f, path, opt, intoTable, "file")
	}
	if err := checkOptions(path, opt, true); err != nil {
		return nil, nil, err
	}
	size := st.Size()
	unpacked, err := checkExpansion(f, size, path, lim.MaxWorkbookBytes)
	if err != nil {
		return nil, nil, err
	}
	rec, t, err := readXLSX(io.NewSectionReader(f, 0, size), path, opt.Sheet, lim, unpacked, intoTable)
	if err != nil {
		return nil, nil, err
	}
	if rec.Digest, err = digestOf(io.NewSectionReader(f, 0, size)); err != nil {
		return nil, nil, &ParseError{File: path, Err: err, Msg: "cannot read the file (" + errText(err) + ")"}
	}
	return rec, t, nil
}

// readStream reads a test file from r, stopping at the size limit. Only a
// workbook is held in memory whole (it is a zip archive, read by its
// directory at the end); CSV text is parsed as it arrives. what names the
// input in read errors ("file" or "input").
func readStream(r io.Reader, name string, opt Options, intoTable bool, what string) (*Record, *rawTable, error) {
	lim := opt.Limits.withDefaults()
	readErr := func(err error) error {
		if errors.Is(err, errTooLarge) {
			return tooLarge(name, lim.MaxBytes)
		}
		return &ParseError{File: name, Err: err, Msg: "cannot read the " + what + " (" + errText(err) + ")"}
	}
	capped := &cappedReader{r: r, max: lim.MaxBytes}
	dw := newDigestWriter()
	rec, t, err := readCapped(io.TeeReader(capped, dw), name, opt, intoTable, lim, readErr)
	if err != nil {
		return nil, nil, err
	}
	// Both parsers read to the end; whatever one left unread would still
	// be part of the input, so the digest takes it too.
	if _, err := io.Copy(dw, capped); err != nil {
		return nil, nil, readErr(err)
	}
	rec.Digest = dw.digest()
	return rec, t, nil
}

// readCapped is readStream's parse of the capped input r.
func readCapped(r io.Reader, name string, opt Options, intoTable bool, lim Limits, readErr func(error) error) (*Record, *rawTable, error) {
	br := bufio.NewReaderSize(r, 64<<10)
	head, err := br.Peek(4)
	if err != nil && err != io.EOF {
		return nil, nil, readErr(err)
	}
	xlsx := isXLSX(name, head)
	if err := checkOptions(name, opt, xlsx); err != nil {
		return nil, nil, err
	}
	if !xlsx {
		p := newTableParser(name, "", lim, intoTable)
		rec, err := readCSV(br, p, readErr)
		return rec, p.table, err
	}
	data, err := io.ReadAll(br)
	if err != nil {
		return nil, nil, readErr(err)
	}
	unpacked, err := checkExpansion(bytes.NewReader(data), int64(len(data)), name, lim.MaxWorkbookBytes)
	if err != nil {
		return nil, nil, err
	}
	return readXLSX(bytes.NewReader(data), name, opt.Sheet, lim, unpacked, intoTable)
}

// checkOptions refuses a sheet asked for in a file that is not a workbook.
func checkOptions(name string, opt Options, xlsx bool) error {
	if opt.Sheet != "" && !xlsx {
		return &ParseError{File: name, Err: ErrOptions, Msg: fmt.Sprintf("a sheet (%s) was asked for, but the file is not an xlsx workbook", quote(opt.Sheet)),
			Fix: "drop the sheet option for CSV files"}
	}
	return nil
}

var errTooLarge = errors.New("too large")

// cappedReader reads r up to max bytes and fails with errTooLarge when r
// holds more, so that a device or an endless stream cannot make a read go
// on without bound.
type cappedReader struct {
	r    io.Reader
	max  int64
	read int64
}

func (c *cappedReader) Read(p []byte) (int, error) {
	if c.read > c.max {
		return 0, errTooLarge
	}
	if room := c.max + 1 - c.read; int64(len(p)) > room {
		p = p[:room]
	}
	n, err := c.r.Read(p)
	c.read += int64(n)
	if c.read > c.max {
		// The byte past the limit is not handed on.
		return n - int(c.read-c.max), errTooLarge
	}
	return n, err
}

func tooLarge(name string, max int64) *ParseError {
	return &ParseError{File: name, Err: ErrFileSize,
		Msg: fmt.Sprintf("the input is larger than %s, the limit for a test file", sizeText(max)),
		Fix: "check that this is the test file meant; if it is, raise the file size limit"}
}

// checkExpansion refuses a workbook whose parts expand beyond max bytes,
// and returns the size they expand to, in bytes (0 for a file that is not
// a zip). The sizes declared in the zip directory are binding: the zip
// reader fails on a part that inflates to more than it declares.
func checkExpansion(r io.ReaderAt, size int64, name string, max int64) (int64, error) {
	zr, err := zip.NewReader(r, size)
	if err != nil {
		return 0, nil // not a zip: the workbook reader says what is wrong
	}
	var total uint64
	for _, f := range zr.File {
		total += f.UncompressedSize64
		if total > uint64(max) {
			return 0, &ParseError{File: name, Err: ErrWorkbookSize,
				Msg: fmt.Sprintf("the workbook expands to more than %s, the limit for an unpacked workbook", sizeText(max)),
				Fix: "save the sheet with the test data alone (or as CSV); if the workbook is what you meant, raise the workbook limit"}
		}
	}
	return int64(total), nil
}

func errText(err error) string {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err.Error()
	}
	return err.Error()
}
