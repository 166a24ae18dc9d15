package biaxial

import (
	"bytes"
	"math"
	"path/filepath"
	"reflect"
	"sync"
	"testing"
)

// One reading prepared several ways gives what reading the file once per
// way gives: ReadRows then Rows.Prepare equals ReadFile for each of a set
// of options (the last cycle, every cycle and branch as measured, one
// unloading branch re-referenced, a resampled cycle), deeply, with the
// preparations run side by side (go test -race checks that they only
// read the rows). Values are compared as reflect.DeepEqual does, but with
// NaN equal to NaN (a point's time without a time column).
func TestRowsPrepareEqualsReadFile(t *testing.T) {
	rec := synthRecord("1:1", 3, 11, 1.01, 1.15, 1)
	more := synthRecord("1:0.5", 3, 9, 1.0, 1.12, 0.5)
	rec.Rows = append(rec.Rows, more.Rows...)
	var buf bytes.Buffer
	if err := WriteRecord(&buf, rec, Layout{}); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "syn-rows.csv")
	if err := writeFile(path, buf.Bytes()); err != nil {
		t.Fatal(err)
	}
	opts := []Options{
		{},
		{Cycle: CycleAll, Branch: BranchAll},
		{Cycle: 2, Branch: BranchUnloading, Rereference: true},
		{Cycle: 1, Resample: 7},
	}
	rows, err := ReadRows(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	got := make([]*Specimen, len(opts))
	errs := make([]error, len(opts))
	var wg sync.WaitGroup
	for i, o := range opts {
		wg.Add(1)
		go func() {
			defer wg.Done()
			got[i], errs[i] = rows.Prepare(o)
		}()
	}
	wg.Wait()
	for i, o := range opts {
		want, err := ReadFile(path, o)
		if err != nil || errs[i] != nil {
			t.Fatalf("options %+v: ReadFile error %v, Prepare error %v", o, err, errs[i])
		}
		if !sameValue(reflect.ValueOf(got[i]), reflect.ValueOf(want)) {
			t.Errorf("options %+v: Rows.Prepare differs from ReadFile", o)
		}
	}
	if _, err := rows.Prepare(Options{Cycle: -5}); err == nil {
		t.Error("invalid options prepared without an error")
	}
}

// sameValue is reflect.DeepEqual with NaN equal to NaN (no cycles: a
// Specimen is a tree).
func sameValue(a, b reflect.Value) bool {
	if a.Kind() != b.Kind() || a.Type() != b.Type() {
		return false
	}
	switch a.Kind() {
	case reflect.Float32, reflect.Float64:
		x, y := a.Float(), b.Float()
		return x == y || (math.IsNaN(x) && math.IsNaN(y))
	case reflect.Pointer, reflect.Interface:
		if a.IsNil() || b.IsNil() {
			return a.IsNil() == b.IsNil()
		}
		return sameValue(a.Elem(), b.Elem())
	case reflect.Struct:
		for i := 0; i < a.NumField(); i++ {
			if !sameValue(a.Field(i), b.Field(i)) {
				return false
			}
		}
		return true
	case reflect.Slice, reflect.Array:
		if a.Len() != b.Len() {
			return false
		}
		for i := 0; i < a.Len(); i++ {
			if !sameValue(a.Index(i), b.Index(i)) {
				return false
			}
		}
		return true
	case reflect.Map:
		if a.Len() != b.Len() {
			return false
		}
		for _, k := range a.MapKeys() {
			if !sameValue(a.MapIndex(k), b.MapIndex(k)) {
				return false
			}
		}
		return true
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return a.Int() == b.Int()
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return a.Uint() == b.Uint()
	case reflect.String:
		return a.String() == b.String()
	case reflect.Bool:
		return a.Bool() == b.Bool()
	default:
		return reflect.DeepEqual(a.Interface(), b.Interface())
	}
}
