package post

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"flangeseg/mesh"
)

// The parts of a .vtu file the tests read back.
type vtkFile struct {
	Type      string `xml:"type,attr"`
	Version   string `xml:"version,attr"`
	ByteOrder string `xml:"byte_order,attr"`
	// HeaderType and Compressor say how the appended arrays are stored.
	HeaderType string `xml:"header_type,attr"`
	Compressor string `xml:"compressor,attr"`
	Piece      struct {
		NumberOfPoints int         `xml:"NumberOfPoints,attr"`
		NumberOfCells  int         `xml:"NumberOfCells,attr"`
		PointData      []dataArray `xml:"PointData>DataArray"`
		CellData       []dataArray `xml:"CellData>DataArray"`
		Points         dataArray   `xml:"Points>DataArray"`
		Cells          []dataArray `xml:"Cells>DataArray"`
	} `xml:"UnstructuredGrid>Piece"`
}

type dataArray struct {
	Type       string `xml:"type,attr"`
	Name       string `xml:"Name,attr"`
	Components int    `xml:"NumberOfComponents,attr"`
	Format     string `xml:"format,attr"`
	Offset     int    `xml:"offset,attr"`
	values     []float64
}

func (d dataArray) numbers(t *testing.T) []float64 {
	t.Helper()
	return d.values
}

func floats(ints ...int) []float64 {
	out := make([]float64, len(ints))
	for i, v := range ints {
		out[i] = float64(v)
	}
	return out
}

// readVTU reads a .vtu file as encodeVTU writes it, decoding every array
// from the appended data section by the documented header.
func readVTU(t *testing.T, path string) vtkFile {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return decodeVTU(t, b)
}

func decodeVTU(t *testing.T, b []byte) vtkFile {
	t.Helper()
	const open = "<AppendedData encoding=\"raw\">\n   _"
	i := bytes.Index(b, []byte(open))
	j := bytes.LastIndex(b, []byte("\n  </AppendedData>\n</VTKFile>\n"))
	if i < 0 || j < i+len(open) {
		t.Fatal("no appended data section")
	}
	data := b[i+len(open) : j]
	var v vtkFile
	if err := xml.Unmarshal(append(append([]byte(nil), b[:i]...), "</VTKFile>"...), &v); err != nil {
		t.Fatalf("the XML part does not parse: %v", err)
	}
	if v.Compressor != "vtkZLibDataCompressor" || v.HeaderType != "UInt64" {
		t.Fatalf("compressor %q, header type %q", v.Compressor, v.HeaderType)
	}
	end := 0
	points := []dataArray{v.Piece.Points}
	for _, arrays := range [][]dataArray{v.Piece.PointData, v.Piece.CellData, points, v.Piece.Cells} {
		for k := range arrays {
			if arrays[k].Format != "appended" || arrays[k].Offset != end {
				t.Fatalf("array %q: format %q at offset %d, want appended at %d (no gaps)", arrays[k].Name, arrays[k].Format, arrays[k].Offset, end)
			}
			var raw []byte
			raw, end = inflateArray(t, data, end)
			arrays[k].values = rawValues(t, arrays[k].Type, raw)
		}
	}
	if end != len(data) {
		t.Fatalf("%d bytes after the last array", len(data)-end)
	}
	v.Piece.Points = points[0]
	return v
}

// inflateArray decodes the compressed array at offset: its header
// [#blocks][#u-size][#p-size][#c-size-1 …] and its blocks.
func inflateArray(t *testing.T, data []byte, offset int) (raw []byte, end int) {
	t.Helper()
	word := func(k int) int { return int(binary.LittleEndian.Uint64(data[offset+8*k:])) }
	n, usize, psize := word(0), word(1), word(2)
	pos := offset + 8*(3+n)
	for k := range n {
		c := word(3 + k)
		zr, err := zlib.NewReader(bytes.NewReader(data[pos : pos+c]))
		if err != nil {
			t.Fatal(err)
		}
		block, err := io.ReadAll(zr)
		if err != nil {
			t.Fatal(err)
		}
		want := usize
		if k == n-1 && psize != 0 {
			want = psize
		}
		if len(block) != want {
			t.Fatalf("block %d of %d: %d bytes, header says %d", k, n, len(block), want)
		}
		raw = append(raw, block...)
		pos += c
	}
	return raw, pos
}

func rawValues(t *testing.T, typ string, raw []byte) []float64 {
	t.Helper()
	var out []float64
	switch typ {
	case "Float64":
		for k := 0; k < len(raw); k += 8 {
			out = append(out, math.Float64frombits(binary.LittleEndian.Uint64(raw[k:])))
		}
	case "Int64":
		for k := 0; k < len(raw); k += 8 {
			out = append(out, float64(int64(binary.LittleEndian.Uint64(raw[k:]))))
		}
	case "UInt8":
		for _, c := range raw {
			out = append(out, float64(c))
		}
	default:
		t.Fatalf("type %q", typ)
	}
	return out
}

func TestWriteVTU(t *testing.T) {
	for _, c := range []struct {
		kind mesh.Kind
		typ  int
	}{{mesh.Quad4, 9}, {mesh.Quad8, 23}} {
		t.Run(c.kind.String(), func(t *testing.T) {
			m, err := mesh.Rect(0, 0, 2, 1, 2, 1, mesh.Region{Name: "plate", Thickness: 1}, c.kind)
			if err != nil {
				t.Fatal(err)
			}
			g := GridFromMesh(m)
			np, nc := len(g.Points), len(g.Cells)
			disp := make([]float64, 2*np) // (ux, uz) per point
			temp := make([]float64, np)
			for i, p := range g.Points {
				disp[2*i], disp[2*i+1] = 0.001*p.X, -0.5*p.Z
				temp[i] = 1.0 / 3 * p.X
			}
			vm := []float64{123.25, 1e-300}
			point := []Field{{"displacement", 2, disp}, {"temperature & <scale>", 1, temp}}
			cell := []Field{{"von_mises", 1, vm}, RegionField(m)}
			path := filepath.Join(t.TempDir(), "state.vtu")
			if err := WriteVTU(path, g, point, cell); err != nil {
				t.Fatal(err)
			}
			v := readVTU(t, path)
			if v.Type != "UnstructuredGrid" || v.Piece.NumberOfPoints != np || v.Piece.NumberOfCells != nc {
				t.Fatalf("header: type %q, %d points, %d cells; want %d, %d", v.Type, v.Piece.NumberOfPoints, v.Piece.NumberOfCells, np, nc)
			}
			var wantPts []float64
			for _, p := range g.Points {
				wantPts = append(wantPts, p.X, p.Z, 0)
			}
			if got := v.Piece.Points.numbers(t); !reflect.DeepEqual(got, wantPts) || v.Piece.Points.Components != 3 {
				t.Errorf("points = %v, want %v", got, wantPts)
			}
			var conn, offs, types []int
			for i, e := range m.Elements {
				conn = append(conn, e.Nodes...)
				offs = append(offs, (i+1)*int(c.kind))
				types = append(types, c.typ)
			}
			want := map[string][]float64{"connectivity": floats(conn...), "offsets": floats(offs...), "types": floats(types...)}
			if len(v.Piece.Cells) != 3 {
				t.Fatalf("%d cell arrays, want 3", len(v.Piece.Cells))
			}
			for _, a := range v.Piece.Cells {
				if got := a.numbers(t); !reflect.DeepEqual(got, want[a.Name]) {
					t.Errorf("%s = %v, want %v", a.Name, got, want[a.Name])
				}
			}
			// Point data: the 2-component displacement comes back as (ux, uz, 0).
			var wantDisp []float64
			for i := range np {
				wantDisp = append(wantDisp, disp[2*i], disp[2*i+1], 0)
			}
			checkArray(t, v.Piece.PointData, 0, "displacement", 3, wantDisp)
			checkArray(t, v.Piece.PointData, 1, "temperature & <scale>", 1, temp)
			checkArray(t, v.Piece.CellData, 0, "von_mises", 1, vm)
			checkArray(t, v.Piece.CellData, 1, "region", 1, []float64{0, 0})
			entries, _ := os.ReadDir(filepath.Dir(path))
			if len(entries) != 1 {
				t.Errorf("folder holds %d files, want only the .vtu", len(entries))
			}
		})
	}
}

func checkArray(t *testing.T, arrays []dataArray, i int, name string, comps int, want []float64) {
	t.Helper()
	if i >= len(arrays) {
		t.Fatalf("array %q missing", name)
	}
	a := arrays[i]
	if a.Name != name || a.Components != comps || a.Type != "Float64" || a.Format != "appended" {
		t.Errorf("array %d: name %q, %d components, %s %s; want %q, %d", i, a.Name, a.Components, a.Type, a.Format, name, comps)
	}
	if got := a.numbers(t); !reflect.DeepEqual(got, want) {
		t.Errorf("%s = %v, want %v (values must read back exactly)", name, got, want)
	}
}

func TestEncodeVTUDeterministic(t *testing.T) {
	m, err := mesh.Rect(0, 0, 1, 1, 3, 3, mesh.Region{Name: "plate", Thickness: 1}, mesh.Quad8)
	if err != nil {
		t.Fatal(err)
	}
	g := GridFromMesh(m)
	var a, b bytes.Buffer
	cell := []Field{RegionField(m)}
	if err := EncodeVTU(&a, g, nil, cell); err != nil {
		t.Fatal(err)
	}
	if err := EncodeVTU(&b, g, nil, cell); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Error("two encodings differ")
	}
	if !strings.Contains(a.String(), "<PointData/>") {
		t.Error("empty point data not written as <PointData/>")
	}
}

func TestWriteVTUErrors(t *testing.T) {
	m, err := mesh.Rect(0, 0, 1, 1, 1, 1, mesh.Region{Name: "plate", Thickness: 1}, mesh.Quad4)
	if err != nil {
		t.Fatal(err)
	}
	g := GridFromMesh(m) // 4 points, 1 cell
	for _, c := range []struct {
		name        string
		grid        func(g Grid) Grid
		point, cell []Field
		want        []string
	}{
		{"point field too short", nil, []Field{{"displacement", 3, make([]float64, 11)}}, nil, []string{`"displacement"`, "11 values, want 12"}},
		{"cell field too long", nil, nil, []Field{{"von_mises", 1, make([]float64, 2)}}, []string{`cell field "von_mises"`, "2 values, want 1"}},
		{"no name", nil, []Field{{"", 1, make([]float64, 4)}}, nil, []string{"point field 0 has no name"}},
		{"twice", nil, []Field{{"gap", 1, make([]float64, 4)}, {"gap", 1, make([]float64, 4)}}, nil, []string{`"gap" appears twice`}},
		{"no components", nil, nil, []Field{{"damage", 0, nil}}, []string{`"damage"`, "0 components"}},
		{"not finite", nil, []Field{{"gap", 1, []float64{0, 1, 2, 0.0 / zero}}}, nil, []string{`"gap"`, "value 3 is NaN"}},
		{"bad kind", func(g Grid) Grid { g.Kind = 6; return g }, nil, nil, []string{"Kind(6)"}},
		{"bad cell", func(g Grid) Grid { g.Cells = [][]int{{0, 1, 2, 7}}; return g }, nil, nil, []string{"cell 0", "node 7"}},
		{"short cell", func(g Grid) Grid { g.Cells = [][]int{{0, 1, 2}}; return g }, nil, nil, []string{"cell 0 has 3 nodes"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			gg := g
			if c.grid != nil {
				gg = c.grid(g)
			}
			dir := t.TempDir()
			path := filepath.Join(dir, "bad.vtu")
			err := WriteVTU(path, gg, c.point, c.cell)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not mention %q", err, w)
				}
			}
			if entries, _ := os.ReadDir(dir); len(entries) != 0 {
				t.Errorf("a failed write left %d files", len(entries))
			}
		})
	}
}

var zero float64

type pvdFile struct {
	Type     string `xml:"type,attr"`
	DataSets []struct {
		Timestep float64 `xml:"timestep,attr"`
		Part     int     `xml:"part,attr"`
		File     string  `xml:"file,attr"`
	} `xml:"Collection>DataSet"`
}

func TestWritePVD(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "series.pvd")
	entries := []SeriesEntry{{0, "state_000.vtu"}, {0.25, "states/state_001.vtu"}, {1, `odd "name".vtu`}}
	if err := WritePVD(path, entries); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var p pvdFile
	if err := xml.Unmarshal(b, &p); err != nil {
		t.Fatal(err)
	}
	if p.Type != "Collection" || len(p.DataSets) != len(entries) {
		t.Fatalf("type %q, %d data sets", p.Type, len(p.DataSets))
	}
	for i, d := range p.DataSets {
		if d.Timestep != entries[i].Time || d.File != entries[i].File {
			t.Errorf("data set %d = %+v, want %+v", i, d, entries[i])
		}
	}
	for _, bad := range []SeriesEntry{{0, ""}, {0, filepath.Join(dir, "abs.vtu")}, {1 / zero, "a.vtu"}} {
		if err := WritePVD(path, []SeriesEntry{bad}); err == nil {
			t.Errorf("entry %+v accepted", bad)
		}
	}
}

func TestWriteFileAtomic(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := WriteFileAtomic(path, func(w io.Writer) error {
		_, err := io.WriteString(w, "first")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	err := WriteFileAtomic(path, func(w io.Writer) error {
		io.WriteString(w, strings.Repeat("partial ", 1<<15)) // more than one buffer
		return boom
	})
	if !errors.Is(err, boom) {
		t.Errorf("err = %v, want it to wrap boom", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "first" {
		t.Errorf("target holds %q after a failed write, want it untouched", b)
	}
	func() {
		defer func() { recover() }()
		WriteFileAtomic(path, func(w io.Writer) error { panic("write panics") })
	}()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 || entries[0].Name() != "out.txt" {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("folder holds %v, want only out.txt", names)
	}
	if info, err := os.Stat(path); err != nil || info.Mode().Perm() != 0o644 {
		t.Errorf("mode %v, %v; want 0644", info.Mode(), err)
	}
	if err := WriteFileAtomic(filepath.Join(dir, "no", "such", "dir.txt"), func(io.Writer) error { return nil }); err == nil {
		t.Error("writing into a missing folder succeeded")
	}
}

// TestAppendedBlocks checks the compressed header of arrays that fill
// their last block exactly (#p-size 0), end in a partial block, or are
// empty, and that the blocks inflate to the bytes added.
func TestAppendedBlocks(t *testing.T) {
	for _, c := range []struct {
		size, blocks, partial int
	}{{0, 0, 0}, {8, 1, 8}, {blockSize, 1, 0}, {blockSize + 8, 2, 8}, {3 * blockSize, 3, 0}} {
		a := newAppended()
		a.add([]byte("before")) // a second array starts where the first ends
		raw := make([]byte, c.size)
		for i := range raw {
			raw[i] = byte(i * i % 251)
		}
		offset := a.add(raw)
		data := a.out.Bytes()
		word := func(k int) int { return int(binary.LittleEndian.Uint64(data[offset+8*k:])) }
		if word(0) != c.blocks || word(1) != blockSize || word(2) != c.partial {
			t.Errorf("%d bytes: header [%d %d %d], want [%d %d %d]", c.size, word(0), word(1), word(2), c.blocks, blockSize, c.partial)
			continue
		}
		got, end := inflateArray(t, data, offset)
		if !bytes.Equal(got, raw) || end != len(data) {
			t.Errorf("%d bytes: %d inflated, end %d of %d", c.size, len(got), end, len(data))
		}
	}
}
