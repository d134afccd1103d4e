package post

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// noTempFiles fails if WriteFileAtomic left a temporary file in dir.
func noTempFiles(t *testing.T, dir string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp-") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s does not parse as CSV: %v", path, err)
	}
	return recs
}

func TestWriteCSVRoundTrip(t *testing.T) {
	tab := Table{Columns: []string{"increment", "Z_kN", "u_mm", "gap_edge_mm"}}
	rows := [][]float64{
		{0, 0, 0, math.NaN()},
		{1, 1.0 / 3, 1e-7, -0.0},
		{2, 12345678901.5, -2.5, math.Inf(1)},
		{3, 0.1 + 0.2, 5e-324, math.Inf(-1)},
	}
	for _, r := range rows {
		if err := tab.Append(r...); err != nil {
			t.Fatal(err)
		}
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "history.csv")
	if err := WriteCSV(path, tab); err != nil {
		t.Fatal(err)
	}
	noTempFiles(t, dir)
	recs := readCSV(t, path)
	if !reflect.DeepEqual(recs[0], tab.Columns) {
		t.Fatalf("header %q, want %q", recs[0], tab.Columns)
	}
	if len(recs) != 1+len(rows) {
		t.Fatalf("%d records, want %d", len(recs), 1+len(rows))
	}
	for i, r := range rows {
		for j, want := range r {
			got := recs[i+1][j]
			if math.IsNaN(want) {
				if got != "" {
					t.Errorf("row %d column %d: NaN written as %q, want empty", i, j, got)
				}
				continue
			}
			v, err := strconv.ParseFloat(got, 64)
			if err != nil {
				t.Errorf("row %d column %d: %v", i, j, err)
				continue
			}
			if v != Round10(want) {
				t.Errorf("row %d column %d: read %v, want %v", i, j, v, Round10(want))
			}
		}
	}
	// The exact spelling of a few numbers.
	want := []string{"1", "0.3333333333", "1e-07", "0"}
	if !reflect.DeepEqual(recs[2], want) {
		t.Errorf("row 1 written as %q, want %q", recs[2], want)
	}
	want = []string{"2", "1.23456789e+10", "-2.5", "+Inf"}
	if !reflect.DeepEqual(recs[3], want) {
		t.Errorf("row 2 written as %q, want %q", recs[3], want)
	}
}

// A one-column row of NaN must not become a blank line, which CSV readers skip.
func TestWriteCSVOneColumnNaN(t *testing.T) {
	tab := Table{Columns: []string{"max_damage"}, Rows: [][]float64{{1}, {math.NaN()}, {2}}}
	path := filepath.Join(t.TempDir(), "one.csv")
	if err := WriteCSV(path, tab); err != nil {
		t.Fatal(err)
	}
	got := readCSV(t, path)
	want := [][]string{{"max_damage"}, {"1"}, {""}, {"2"}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("read %q, want %q", got, want)
	}
}

func TestTableAppend(t *testing.T) {
	tab := Table{Columns: []string{"Z_kN", "u_mm"}}
	row := []float64{1, 2}
	if err := tab.Append(row...); err != nil {
		t.Fatal(err)
	}
	row[0] = 99 // Append keeps a copy, not the caller's slice
	if tab.Rows[0][0] != 1 {
		t.Errorf("Append kept the caller's slice: row is %v", tab.Rows[0])
	}
	err := tab.Append(1, 2, 3)
	if err == nil {
		t.Fatal("row of 3 values into 2 columns: no error")
	}
	if !strings.Contains(err.Error(), "3 values") || !strings.Contains(err.Error(), "2 columns") {
		t.Errorf("error %q does not name both lengths", err)
	}
	if len(tab.Rows) != 1 {
		t.Errorf("failed Append changed the table: %d rows", len(tab.Rows))
	}
}

func TestWriteCSVErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		tab  Table
		want string
	}{
		{"no columns", Table{}, "no columns"},
		{"empty name", Table{Columns: []string{"Z_kN", ""}}, "column 1 has no name"},
		{"comma", Table{Columns: []string{"Z,kN"}}, `"Z,kN"`},
		{"quote", Table{Columns: []string{`Z"kN`}}, "quote"},
		{"line break", Table{Columns: []string{"Z\nkN"}}, "line break"},
		{"space", Table{Columns: []string{" Z_kN"}}, "space"},
		{"duplicate", Table{Columns: []string{"Z_kN", "u_mm", "Z_kN"}}, `columns 0 and 2 are both named "Z_kN"`},
		{"short row", Table{Columns: []string{"Z_kN", "u_mm"}, Rows: [][]float64{{1, 2}, {3}}}, "row 1 has 1 values, the table has 2 columns"},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "bad.csv")
			err := WriteCSV(path, c.tab)
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), path) {
				t.Errorf("error %q does not contain %q and the path", err, c.want)
			}
			if _, err := os.Stat(path); !os.IsNotExist(err) {
				t.Errorf("file written despite the error")
			}
			noTempFiles(t, dir)
			if err := EncodeCSV(io.Discard, c.tab); err == nil {
				t.Error("EncodeCSV: no error")
			}
		})
	}
}

func ExampleEncodeCSV() {
	tab := Table{Columns: []string{"increment", "Z_kN", "gap_edge_mm"}}
	tab.Append(0, 0, math.NaN()) // no gap before the face opens
	tab.Append(1, 125.0/3, 0.0125)
	if err := EncodeCSV(os.Stdout, tab); err != nil {
		fmt.Println(err)
	}
	// Output:
	// increment,Z_kN,gap_edge_mm
	// 0,0,
	// 1,41.66666667,0.0125
}

func BenchmarkEncodeCSV(b *testing.B) {
	// A long history: 2000 increments × 14 columns.
	tab := Table{}
	for j := range 14 {
		tab.Columns = append(tab.Columns, fmt.Sprintf("c%d_kN", j))
	}
	for i := range 2000 {
		row := make([]float64, 14)
		for j := range row {
			row[j] = math.Sin(float64(i*14+j)) * 1e3
		}
		tab.Rows = append(tab.Rows, row)
	}
	b.ReportAllocs()
	for b.Loop() {
		if err := EncodeCSV(io.Discard, tab); err != nil {
			b.Fatal(err)
		}
	}
}
