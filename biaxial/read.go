package biaxial

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"os"
)

// ReadRecordFile reads a test file (CSV, or xlsx by its .xlsx extension or
// content) into a Record without selecting cycles. Of opt only Sheet and
// Limits are used.
func ReadRecordFile(path string, opt Options) (*Record, error) {
	lim := opt.Limits.withDefaults()
	f, err := os.Open(path)
	if err != nil {
		return nil, &ParseError{File: path, Err: err, Msg: "cannot read the file (" + errText(err) + ")",
			Fix: "check the path and permissions"}
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.Mode().IsRegular() && st.Size() > lim.MaxBytes {
		return nil, tooLarge(path, lim.MaxBytes)
	}
	data, err := readAtMost(f, lim.MaxBytes)
	if err != nil {
		if err == errTooLarge {
			return nil, tooLarge(path, lim.MaxBytes)
		}
		return nil, &ParseError{File: path, Err: err, Msg: "cannot read the file (" + errText(err) + ")"}
	}
	return parseBytes(data, path, opt)
}

// ReadRecord reads a test file from r into a Record without selecting
// cycles. name is used in messages and to tell xlsx from CSV (by the .xlsx
// extension, or by the zip signature of the content). Of opt only Sheet and
// Limits are used.
func ReadRecord(r io.Reader, name string, opt Options) (*Record, error) {
	lim := opt.Limits.withDefaults()
	data, err := readAtMost(r, lim.MaxBytes)
	if err != nil {
		if err == errTooLarge {
			return nil, tooLarge(name, lim.MaxBytes)
		}
		return nil, &ParseError{File: name, Err: err, Msg: "cannot read the input (" + errText(err) + ")"}
	}
	return parseBytes(data, name, opt)
}

var errTooLarge = fmt.Errorf("too large")

// readAtMost reads r whole unless it holds more than max bytes, so that a
// device or an endless stream cannot grow memory without bound.
func readAtMost(r io.Reader, max int64) ([]byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, max+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > max {
		return nil, errTooLarge
	}
	return data, nil
}

func tooLarge(name string, max int64) *ParseError {
	return &ParseError{File: name, Err: ErrFileSize,
		Msg: fmt.Sprintf("the input is larger than %s, the limit for a test file", sizeText(max)),
		Fix: "check that this is the test file meant; if it is, raise the file size limit"}
}

func parseBytes(data []byte, name string, opt Options) (*Record, error) {
	lim := opt.Limits.withDefaults()
	if isXLSX(name, data) {
		if err := checkExpansion(data, name, lim.MaxWorkbookBytes); err != nil {
			return nil, err
		}
		return readXLSX(data, name, opt.Sheet, lim)
	}
	if opt.Sheet != "" {
		return nil, &ParseError{File: name, Err: ErrOptions, Msg: fmt.Sprintf("a sheet (%s) was asked for, but the file is not an xlsx workbook", quote(opt.Sheet)),
			Fix: "drop the sheet option for CSV files"}
	}
	return readCSV(string(data), name, lim)
}

// checkExpansion refuses a workbook whose parts expand beyond max bytes.
// The sizes declared in the zip directory are binding: the zip reader fails
// on a part that inflates to more than it declares.
func checkExpansion(data []byte, name string, max int64) error {
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return nil // not a zip: the workbook reader says what is wrong
	}
	var total uint64
	for _, f := range zr.File {
		total += f.UncompressedSize64
		if total > uint64(max) {
			return &ParseError{File: name, Err: ErrWorkbookSize,
				Msg: fmt.Sprintf("the workbook expands to more than %s, the limit for an unpacked workbook", sizeText(max)),
				Fix: "save the sheet with the test data alone (or as CSV); if the workbook is what you meant, raise the workbook limit"}
		}
	}
	return nil
}

// ReadFile reads a test file and prepares it with opt: ReadRecordFile
// followed by Prepare.
func ReadFile(path string, opt Options) (*Specimen, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	rec, err := ReadRecordFile(path, opt)
	if err != nil {
		return nil, err
	}
	return Prepare(rec, opt)
}

// Read reads a test file from r and prepares it with opt: ReadRecord
// followed by Prepare. name is used in messages and to recognise xlsx.
func Read(r io.Reader, name string, opt Options) (*Specimen, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	rec, err := ReadRecord(r, name, opt)
	if err != nil {
		return nil, err
	}
	return Prepare(rec, opt)
}

func errText(err error) string {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err.Error()
	}
	return err.Error()
}
