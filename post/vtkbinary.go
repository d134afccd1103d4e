package post

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"fmt"
	"io"
	"math"
)

// The binary layout of a .vtu file follows the VTK XML file-format
// documentation (Kitware, "VTK File Formats", section "XML File Formats",
// and the wiki page "VTK XML Formats", https://vtk.org/Wiki/VTK_XML_Formats,
// sections "Appended Data Section" and "Compressed Data"):
//
//   - The root element carries byte_order="LittleEndian",
//     header_type="UInt64" (every header integer is an 8-byte unsigned
//     integer) and compressor="vtkZLibDataCompressor".
//   - Each DataArray has format="appended" and offset="N": its bytes start N
//     bytes after the underscore that opens <AppendedData encoding="raw">.
//   - An array's bytes are split into blocks of blockSize bytes, the last
//     one possibly shorter, each compressed on its own as a zlib stream.
//     They are preceded by the header
//     [#blocks][#u-size][#p-size][#c-size-1] … [#c-size-#blocks]:
//     the number of blocks, the uncompressed size of a block, the
//     uncompressed size of the last block if it is partial (0 if it is
//     full), and the compressed size of each block.
//   - The arrays follow one another without gaps; a newline closes the
//     data before </AppendedData>.

// blockSize is the uncompressed size of a full block, bytes. A multiple of
// 8, so no value straddles two blocks.
const blockSize = 1 << 15

// compressionLevel is zlib's level for the field files: on a demo state
// level 1 gives 0.59 MB against the default level 6's 0.57 MB, in less
// time (BENCHMARKS.md, "Field files").
const compressionLevel = zlib.BestSpeed

// appended is the appended data section being built: the compressed
// arrays one after the other.
type appended struct {
	out bytes.Buffer
	zw  *zlib.Writer
	raw []byte // scratch: one array's uncompressed bytes
}

func newAppended() *appended {
	a := &appended{}
	a.zw, _ = zlib.NewWriterLevel(nil, compressionLevel) // a valid constant level never fails
	return a
}

// add compresses raw as one array and returns its offset in the section.
func (a *appended) add(raw []byte) int {
	offset := a.out.Len()
	n := (len(raw) + blockSize - 1) / blockSize
	partial := len(raw) % blockSize
	header := make([]byte, 8*(3+n))
	binary.LittleEndian.PutUint64(header[0:], uint64(n))
	binary.LittleEndian.PutUint64(header[8:], blockSize)
	binary.LittleEndian.PutUint64(header[16:], uint64(partial))
	a.out.Write(header) // sizes filled in below
	for i := range n {
		start := a.out.Len()
		a.zw.Reset(&a.out)
		a.zw.Write(raw[i*blockSize : min(len(raw), (i+1)*blockSize)]) // a bytes.Buffer never fails
		a.zw.Close()
		binary.LittleEndian.PutUint64(a.out.Bytes()[offset+8*(3+i):], uint64(a.out.Len()-start))
	}
	return offset
}

// floats adds values as Float64, each group of from values widened to to
// components with zeros (from ≤ to).
func (a *appended) floats(values []float64, from, to int) int {
	a.raw = a.raw[:0]
	for k := 0; k < len(values); k += from {
		for _, v := range values[k : k+from] {
			a.raw = binary.LittleEndian.AppendUint64(a.raw, math.Float64bits(v))
		}
		for range to - from {
			a.raw = binary.LittleEndian.AppendUint64(a.raw, 0)
		}
	}
	return a.add(a.raw)
}

// points adds the grid's points as Float64 (x, z, 0).
func (a *appended) points(g Grid) int {
	a.raw = a.raw[:0]
	for _, p := range g.Points {
		a.raw = binary.LittleEndian.AppendUint64(a.raw, math.Float64bits(p.X))
		a.raw = binary.LittleEndian.AppendUint64(a.raw, math.Float64bits(p.Z))
		a.raw = binary.LittleEndian.AppendUint64(a.raw, 0)
	}
	return a.add(a.raw)
}

// ints adds the n values f(0) … f(n−1) as Int64.
func (a *appended) ints(n int, f func(i int) int) int {
	a.raw = a.raw[:0]
	for i := range n {
		a.raw = binary.LittleEndian.AppendUint64(a.raw, uint64(int64(f(i))))
	}
	return a.add(a.raw)
}

// bytesOf adds n copies of b as UInt8.
func (a *appended) bytesOf(n int, b byte) int {
	a.raw = a.raw[:0]
	for range n {
		a.raw = append(a.raw, b)
	}
	return a.add(a.raw)
}

// vtuArray is one DataArray element of the file.
type vtuArray struct {
	typ, name  string
	components int
	offset     int
}

func (v vtuArray) element() string {
	s := `<DataArray type="` + v.typ + `"`
	if v.name != "" {
		s += ` Name="` + attr(v.name) + `"`
	}
	if v.components > 0 {
		s += fmt.Sprintf(` NumberOfComponents="%d"`, v.components)
	}
	return s + fmt.Sprintf(` format="appended" offset="%d"/>`, v.offset)
}

// vtuLayout is the arrays of a file by section, with their offsets.
type vtuLayout struct {
	point, cell, points, cells []vtuArray
}

// pack compresses every array of the file into a, in the order the XML
// lists them, and returns where each went.
func pack(a *appended, g Grid, pointData, cellData []Field) vtuLayout {
	var l vtuLayout
	field := func(f Field) vtuArray {
		out := f.Components
		if out == 2 {
			out = 3 // a 2D vector as a VTK 3-vector
		}
		return vtuArray{typ: "Float64", name: f.Name, components: out, offset: a.floats(f.Values, f.Components, out)}
	}
	for _, f := range pointData {
		l.point = append(l.point, field(f))
	}
	for _, f := range cellData {
		l.cell = append(l.cell, field(f))
	}
	l.points = []vtuArray{{typ: "Float64", components: 3, offset: a.points(g)}}
	nodes := int(g.Kind)
	typ, _ := cellType(g.Kind)
	l.cells = []vtuArray{
		{typ: "Int64", name: "connectivity", offset: a.ints(len(g.Cells)*nodes, func(i int) int { return g.Cells[i/nodes][i%nodes] })},
		{typ: "Int64", name: "offsets", offset: a.ints(len(g.Cells), func(i int) int { return (i + 1) * nodes })},
		{typ: "UInt8", name: "types", offset: a.bytesOf(len(g.Cells), byte(typ))},
	}
	return l
}

// encodeVTU writes the XML part, listing every array with its offset,
// then the appended data section.
func encodeVTU(w io.Writer, g Grid, pointData, cellData []Field) error {
	a := newAppended()
	l := pack(a, g, pointData, cellData)
	e := &encoder{w: w, buf: make([]byte, 0, 1<<12)}
	e.str(`<?xml version="1.0"?>` + "\n")
	e.str(`<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt64" compressor="vtkZLibDataCompressor">` + "\n")
	e.str("  <UnstructuredGrid>\n")
	e.str(fmt.Sprintf("    <Piece NumberOfPoints=\"%d\" NumberOfCells=\"%d\">\n", len(g.Points), len(g.Cells)))
	e.section("PointData", l.point)
	e.section("CellData", l.cell)
	e.section("Points", l.points)
	e.section("Cells", l.cells)
	e.str("    </Piece>\n  </UnstructuredGrid>\n")
	e.str("  <AppendedData encoding=\"raw\">\n   _")
	e.flush()
	if e.err == nil {
		_, e.err = w.Write(a.out.Bytes())
	}
	e.str("\n  </AppendedData>\n</VTKFile>\n")
	e.flush()
	return e.err
}

// section writes one element of a piece that holds data arrays.
func (e *encoder) section(tag string, arrays []vtuArray) {
	if len(arrays) == 0 {
		e.str("      <" + tag + "/>\n")
		return
	}
	e.str("      <" + tag + ">\n")
	for _, v := range arrays {
		e.str("        " + v.element() + "\n")
	}
	e.str("      </" + tag + ">\n")
}
