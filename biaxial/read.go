package biaxial

import (
	"fmt"
	"io"
	"os"
)

// ReadRecordFile reads a test file (CSV, or xlsx by its .xlsx extension or
// content) into a Record without selecting cycles. Of opt only Sheet is used.
func ReadRecordFile(path string, opt Options) (*Record, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, &ParseError{File: path, Err: err, Msg: "cannot read the file (" + errText(err) + ")",
			Fix: "check the path and permissions"}
	}
	return parseBytes(data, path, opt)
}

// ReadRecord reads a test file from r into a Record without selecting
// cycles. name is used in messages and to tell xlsx from CSV (by the .xlsx
// extension, or by the zip signature of the content). Of opt only Sheet is
// used.
func ReadRecord(r io.Reader, name string, opt Options) (*Record, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, &ParseError{File: name, Err: err, Msg: "cannot read the input (" + errText(err) + ")"}
	}
	return parseBytes(data, name, opt)
}

func parseBytes(data []byte, name string, opt Options) (*Record, error) {
	if isXLSX(name, data) {
		return readXLSX(data, name, opt.Sheet)
	}
	if opt.Sheet != "" {
		return nil, &ParseError{File: name, Err: ErrOptions, Msg: fmt.Sprintf("a sheet (%q) was asked for, but the file is not an xlsx workbook", opt.Sheet),
			Fix: "drop the sheet option for CSV files"}
	}
	return readCSV(string(data), name)
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
