package post

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"testing"

	"flangeseg/mesh"
)

// readerScripts read a .vtu file (argv[1]) with one of Debian's Python
// VTK readers and print every array as JSON: the points, the cell
// connectivity, offsets and types, and each point and cell array by name,
// flattened. Python's float repr reads back to the same float64.
var readerScripts = map[string]string{
	"vtk": `
import json, sys
from vtkmodules.vtkIOXML import vtkXMLUnstructuredGridReader
from vtkmodules.util.numpy_support import vtk_to_numpy
r = vtkXMLUnstructuredGridReader()
r.SetFileName(sys.argv[1])
r.Update()
if r.GetErrorCode() != 0:
    sys.exit("vtk reader error %d" % r.GetErrorCode())
g = r.GetOutput()
def arrays(data):
    return {data.GetArrayName(i): vtk_to_numpy(data.GetArray(i)).ravel().tolist() for i in range(data.GetNumberOfArrays())}
cells = g.GetCells()
print(json.dumps({
    "points": vtk_to_numpy(g.GetPoints().GetData()).ravel().tolist(),
    "connectivity": vtk_to_numpy(cells.GetConnectivityArray()).tolist(),
    "offsets": vtk_to_numpy(cells.GetOffsetsArray()).tolist()[1:],
    "types": vtk_to_numpy(g.GetCellTypesArray()).tolist(),
    "point": arrays(g.GetPointData()),
    "cell": arrays(g.GetCellData()),
}))
`,
	"meshio": `
import json, sys
import meshio
m = meshio.read(sys.argv[1])
if len(m.cells) != 1:
    sys.exit("%d cell blocks, want 1" % len(m.cells))
c = m.cells[0]
n = c.data.shape[1]
ids = {"quad": 9, "quad8": 23}
print(json.dumps({
    "points": m.points.ravel().tolist(),
    "connectivity": c.data.ravel().tolist(),
    "offsets": [n * (i + 1) for i in range(len(c.data))],
    "types": [ids[c.type]] * len(c.data),
    "point": {k: v.ravel().tolist() for k, v in m.point_data.items()},
    "cell": {k: v[0].ravel().tolist() for k, v in m.cell_data.items()},
}))
`,
}

// readBack is what a reader script prints.
type readBack struct {
	Points       []float64
	Connectivity []int
	Offsets      []int
	Types        []int
	Point, Cell  map[string][]float64
}

// python finds a Python 3 that imports module: Debian's own first (its
// packages install there), then the one on PATH.
func python(module string) (string, bool) {
	for _, p := range []string{"/usr/bin/python3", "python3"} {
		if exec.Command(p, "-c", "import "+module).Run() == nil {
			return p, true
		}
	}
	return "", false
}

// TestVTUReadByPythonReaders writes field files and reads every array back
// with Debian's python3-vtk9 and python3-meshio (.ci/run installs both),
// comparing each value with the one written, bit for bit. Outside CI
// (CI unset) a reader that is not installed is skipped; in CI it fails.
func TestVTUReadByPythonReaders(t *testing.T) {
	for _, reader := range []struct{ name, module string }{{"vtk", "vtkmodules.vtkIOXML"}, {"meshio", "meshio"}} {
		t.Run(reader.name, func(t *testing.T) {
			py, ok := python(reader.module)
			if !ok {
				if os.Getenv("CI") == "" {
					t.Skipf("python module %s not installed (Debian: python3-vtk9, python3-meshio); runs in CI", reader.module)
				}
				t.Fatalf("python module %s not installed; CI needs it (.ci/run installs it)", reader.module)
			}
			for _, kind := range []mesh.Kind{mesh.Quad4, mesh.Quad8} {
				t.Run(kind.String(), func(t *testing.T) {
					g, point, cell := readerState(t, kind)
					path := filepath.Join(t.TempDir(), "state.vtu")
					if err := WriteVTU(path, g, point, cell); err != nil {
						t.Fatal(err)
					}
					out, err := exec.Command(py, "-c", readerScripts[reader.name], path).Output()
					if err != nil {
						t.Fatalf("%s: %v\n%s", reader.name, err, stderrOf(err))
					}
					var got readBack
					if err := json.Unmarshal(out, &got); err != nil {
						t.Fatalf("%s printed %.200q: %v", reader.name, out, err)
					}
					compareReadBack(t, got, g, point, cell)
				})
			}
		})
	}
}

func stderrOf(err error) string {
	if ee, ok := err.(*exec.ExitError); ok {
		return string(ee.Stderr)
	}
	return ""
}

// readerState is a grid large enough that its arrays span several
// compressed blocks, some ending in a partial block and some not, with
// point and cell fields of awkward values (tiny, huge, negative,
// thirds), as every field kind of a run: a 2-component vector, a
// 3-component vector, scalars.
func readerState(t *testing.T, kind mesh.Kind) (Grid, []Field, []Field) {
	t.Helper()
	m, err := mesh.Rect(-40, -25, 60, 35, 63, 63, mesh.Region{Name: "plate", Thickness: 1}, kind)
	if err != nil {
		t.Fatal(err)
	}
	g := GridFromMesh(m)
	np, nc := len(g.Points), len(g.Cells)
	disp2, vec3, vm := make([]float64, 2*np), make([]float64, 3*np), make([]float64, np)
	for i, p := range g.Points {
		disp2[2*i], disp2[2*i+1] = 1e-3*p.X/3, -2e-4*p.Z/7
		vec3[3*i], vec3[3*i+1], vec3[3*i+2] = p.X, -p.Z, math.Pi*float64(i)
		vm[i] = 355 * math.Sin(p.X) / (p.Z + 17.25)
	}
	vm[0], vm[1], vm[2] = 1e-300, -1.7976931348623157e308, math.SmallestNonzeroFloat64
	damage := make([]float64, nc)
	for e := range damage {
		damage[e] = float64(e) / 3
	}
	point := []Field{{"displacement", 2, disp2}, {"traction", 3, vec3}, {"von_mises", 1, vm}}
	return g, point, []Field{{"damage", 1, damage}, RegionField(m)}
}

// compareReadBack checks every array a reader returned against what was
// written, exactly.
func compareReadBack(t *testing.T, got readBack, g Grid, point, cell []Field) {
	t.Helper()
	var pts []float64
	for _, p := range g.Points {
		pts = append(pts, p.X, p.Z, 0)
	}
	var conn, offs, types []int
	typ, _ := cellType(g.Kind)
	for i, c := range g.Cells {
		conn = append(conn, c...)
		offs = append(offs, (i+1)*len(c))
		types = append(types, typ)
	}
	same(t, "points", got.Points, pts)
	same(t, "connectivity", got.Connectivity, conn)
	same(t, "offsets", got.Offsets, offs)
	same(t, "types", got.Types, types)
	fields := func(where string, arrays map[string][]float64, written []Field) {
		if len(arrays) != len(written) {
			t.Errorf("%s data: %d arrays read, %d written", where, len(arrays), len(written))
		}
		for _, f := range written {
			same(t, where+" "+f.Name, arrays[f.Name], padded(f))
		}
	}
	fields("point", got.Point, point)
	fields("cell", got.Cell, cell)
}

// padded is a field's values as the file holds them: a 2-component vector
// as (a, b, 0).
func padded(f Field) []float64 {
	if f.Components != 2 {
		return f.Values
	}
	out := make([]float64, 0, len(f.Values)/2*3)
	for k := 0; k < len(f.Values); k += 2 {
		out = append(out, f.Values[k], f.Values[k+1], 0)
	}
	return out
}

func same[T comparable](t *testing.T, name string, got, want []T) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d values read back, %d written", name, len(got), len(want))
		return
	}
	if !reflect.DeepEqual(got, want) {
		for i := range got {
			if got[i] != want[i] {
				t.Errorf("%s[%d] = %v read back, %v written", name, i, got[i], want[i])
				return
			}
		}
	}
}
