package post

import (
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"flangeseg/mesh"
)

// Field is named point or cell data: Components values per point or cell,
// interleaved. A 2-component field is written as a 3-component VTK vector
// with a zero third component.
type Field struct {
	Name       string
	Components int
	Values     []float64
}

// Grid is an unstructured grid of the x–z section for VTK output.
type Grid struct {
	Points []mesh.Point
	Cells  [][]int   // node numbers in mesh.Element order
	Kind   mesh.Kind // Quad4 → VTK_QUAD (9); Quad8 → VTK_QUADRATIC_QUAD (23)
}

// VTK cell type numbers.
const (
	vtkQuad          = 9
	vtkQuadraticQuad = 23
)

// GridFromMesh returns the grid of m. The grid shares no memory with m.
func GridFromMesh(m *mesh.Mesh) Grid {
	g := Grid{Points: append([]mesh.Point(nil), m.Nodes...), Kind: m.Kind, Cells: make([][]int, len(m.Elements))}
	n := 0
	for _, e := range m.Elements {
		n += len(e.Nodes)
	}
	all := make([]int, 0, n)
	for i, e := range m.Elements {
		start := len(all)
		all = append(all, e.Nodes...)
		g.Cells[i] = all[start:len(all):len(all)]
	}
	return g
}

// RegionField returns the cell data "region": each element's index into
// m.Regions.
func RegionField(m *mesh.Mesh) Field {
	v := make([]float64, len(m.Elements))
	for i, e := range m.Elements {
		v[i] = float64(e.Region)
	}
	return Field{Name: "region", Components: 1, Values: v}
}

// WriteVTU writes a VTK XML UnstructuredGrid file (.vtu) with the grid's
// points as (x, z, 0), the given point data and cell data: every array in
// binary, zlib-compressed, in the file's appended data section (see
// encodeVTU for the layout).
func WriteVTU(path string, g Grid, pointData, cellData []Field) error {
	if err := validate(g, pointData, cellData); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	return WriteFileAtomic(path, func(w io.Writer) error { return encodeVTU(w, g, pointData, cellData) })
}

// EncodeVTU writes what WriteVTU puts in a file to w.
func EncodeVTU(w io.Writer, g Grid, pointData, cellData []Field) error {
	if err := validate(g, pointData, cellData); err != nil {
		return fmt.Errorf("post: %w", err)
	}
	return encodeVTU(w, g, pointData, cellData)
}

func cellType(k mesh.Kind) (int, error) {
	switch k {
	case mesh.Quad4:
		return vtkQuad, nil
	case mesh.Quad8:
		return vtkQuadraticQuad, nil
	}
	return 0, fmt.Errorf("grid kind %v is neither Quad4 nor Quad8", k)
}

func validate(g Grid, pointData, cellData []Field) error {
	if _, err := cellType(g.Kind); err != nil {
		return err
	}
	for i, p := range g.Points {
		if !finite(p.X) || !finite(p.Z) {
			return fmt.Errorf("point %d: coordinates (%g, %g) are not finite", i, p.X, p.Z)
		}
	}
	for c, nodes := range g.Cells {
		if len(nodes) != int(g.Kind) {
			return fmt.Errorf("cell %d has %d nodes, a %v cell has %d", c, len(nodes), g.Kind, int(g.Kind))
		}
		for _, n := range nodes {
			if n < 0 || n >= len(g.Points) {
				return fmt.Errorf("cell %d: node %d does not exist (%d points)", c, n, len(g.Points))
			}
		}
	}
	return errors.Join(
		validateFields("point", pointData, len(g.Points)),
		validateFields("cell", cellData, len(g.Cells)),
	)
}

func validateFields(where string, fields []Field, count int) error {
	seen := make(map[string]bool, len(fields))
	var errs []error
	for i, f := range fields {
		name := fmt.Sprintf("%s field %q", where, f.Name)
		switch {
		case f.Name == "":
			errs = append(errs, fmt.Errorf("%s field %d has no name", where, i))
			continue
		case seen[f.Name]:
			errs = append(errs, fmt.Errorf("%s appears twice", name))
			continue
		case f.Components < 1:
			errs = append(errs, fmt.Errorf("%s: %d components, need at least 1", name, f.Components))
			continue
		case len(f.Values) != count*f.Components:
			errs = append(errs, fmt.Errorf("%s: %d values, want %d (%d %ss × %d components)",
				name, len(f.Values), count*f.Components, count, where, f.Components))
			continue
		}
		seen[f.Name] = true
		for k, v := range f.Values {
			if !finite(v) {
				errs = append(errs, fmt.Errorf("%s: value %d is %g", name, k, v))
				break
			}
		}
	}
	return errors.Join(errs...)
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// encoder writes text into w through one scratch buffer; the first
// error sticks and later writes do nothing.
type encoder struct {
	w   io.Writer
	buf []byte
	err error
}

func (e *encoder) flush() {
	if e.err == nil {
		_, e.err = e.w.Write(e.buf)
	}
	e.buf = e.buf[:0]
}

func (e *encoder) str(s string) {
	e.buf = append(e.buf, s...)
	if len(e.buf) > 1<<15 {
		e.flush()
	}
}

func (e *encoder) float(v float64) { e.buf = strconv.AppendFloat(e.buf, v, 'g', -1, 64) }

// attr escapes s for use inside a double-quoted XML attribute.
func attr(s string) string {
	var b strings.Builder
	xml.EscapeText(&b, []byte(s)) // a strings.Builder never fails
	return b.String()
}

// SeriesEntry is one state of a series: its time and its file, relative to
// the folder of the collection file.
type SeriesEntry struct {
	Time float64
	File string
}

// WritePVD writes a VTK collection file (.pvd) listing the entries in the
// order given.
func WritePVD(path string, entries []SeriesEntry) error {
	for i, s := range entries {
		switch {
		case s.File == "":
			return fmt.Errorf("post: write %s: entry %d has no file", path, i)
		case filepath.IsAbs(s.File):
			return fmt.Errorf("post: write %s: entry %d: file %q must be relative to the collection's folder", path, i, s.File)
		case !finite(s.Time):
			return fmt.Errorf("post: write %s: entry %d: time %g is not finite", path, i, s.Time)
		}
	}
	return WriteFileAtomic(path, func(w io.Writer) error {
		e := &encoder{w: w}
		e.str(`<?xml version="1.0"?>` + "\n")
		e.str(`<VTKFile type="Collection" version="1.0" byte_order="LittleEndian">` + "\n")
		e.str("  <Collection>\n")
		for _, s := range entries {
			e.str(`    <DataSet timestep="`)
			e.float(s.Time)
			e.str(`" group="" part="0" file="` + attr(filepath.ToSlash(s.File)) + "\"/>\n")
		}
		e.str("  </Collection>\n</VTKFile>\n")
		e.flush()
		return e.err
	})
}
