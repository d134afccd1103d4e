package report

import (
	"bytes"
	"fmt"
	"io"
	"math"

	"flangeseg/post"
)

// Report is the calculation note of one run. Every part but Title and
// Caution may be left empty; its section then says that the run has no
// such data, so the numbering stays the same from run to run.
type Report struct {
	Title     string // the joint or variant, as in the model file's title
	Model     string // model file name, e.g. "bands.toml"
	Generated string // fixed text given by the caller (tool version, input checksum, date of the input); the package reads no clock
	Caution   string // the design-aid caution; shown near the top and in the last section; required

	// Joint is the drawing of the modelled section with its dimensions;
	// nil leaves it out.
	Joint *JointDrawing

	Inputs  []Quantities // the model's inputs, one table per group (tower and shell, flange, bolt, contact, load, mesh)
	Preload Quantities   // target and reached preload, method, locked shortening
	Results Quantities   // key figures of the joint: stiffness, load factor, opening, decompression and peak loads

	Curves          []post.Plot // bolt force, bolt moment, gap … against the segment force
	HandVersusFE    Table       // ultimate loads and stiffness by FE and by the hand methods, with ratios and sources
	ContactPressure []post.Plot // contact pressure [MPa] along the interface x [mm], one series per load level
	Fields          []Field     // field pictures drawn from the mesh (von Mises stress, plastic strain)
	Convergence     Quantities  // increments, Newton iterations, factorizations, times, largest penetration
	Notes           []string    // remarks of the analyst or the tool, one paragraph each
}

// Compare is the calculation note of several runs side by side, such as a
// flat face against defined contact bands. Runs[0] is the reference that
// the ratios of Comparison refer to.
type Compare struct {
	Title     string // what is compared
	Generated string // fixed text given by the caller; see Report.Generated
	Caution   string // the design-aid caution; required

	Comparison Table       // one row per figure, a column per run and its ratio to the first run
	Overlays   []post.Plot // curves of all runs overlaid, one series per run
	Runs       []Report    // the runs in full; their Caution and Generated are not shown (the Compare's are)
	Notes      []string
}

// Quantities is a table of named values, one per row: symbol, name,
// value, unit and source.
type Quantities struct {
	Caption string
	Rows    []Quantity
}

// Quantity is one named value.
type Quantity struct {
	Symbol string // trade symbol, e.g. "t_f" or "F_p,C"; the part after the first '_' is set as a subscript; may be empty
	Name   string // plain words, e.g. "flange thickness"
	Value  Cell   // a number with its unit, or a text
	Source string // where the value comes from: "model file", "default", "FE, this run", "EN 1993-1-8, 3.9" …; required
}

// Table is a grid of cells under column headings, with a source note
// below it.
type Table struct {
	Caption string
	Columns []Column
	Rows    [][]Cell // one cell per column
	Source  string   // where the numbers come from; required for a table with rows
}

// Column is a table column. Its unit, shown in the heading as
// "peak load [kN]", applies to every number of the column that has none
// of its own.
type Column struct {
	Heading string
	Unit    string
}

// Dimensionless is the unit of a pure number such as a load factor or a
// ratio. A number must name its unit; this one is shown as "–".
const Dimensionless = "1"

// Cell is one value: a number with its unit, or a text. Build one with
// Num, NumDigits or Text.
type Cell struct {
	Value  float64 // NaN: the value does not exist (shown as "—"), e.g. an opening load that is not reached
	Unit   string  // "mm", "kN", "kN/mm", "MPa", Dimensionless …; empty: the column's unit
	Digits int     // significant digits; 0 means 4. Integer parts are never rounded away
	Text   string  // shown instead of a number when IsText
	IsText bool
}

// Num returns a number cell with its unit, shown to 4 significant digits.
func Num(v float64, unit string) Cell { return Cell{Value: v, Unit: unit} }

// NumDigits returns a number cell shown to the given significant digits.
func NumDigits(v float64, unit string, digits int) Cell {
	return Cell{Value: v, Unit: unit, Digits: digits}
}

// Text returns a text cell, such as a grade, a mode or a file name.
func Text(s string) Cell { return Cell{Text: s, IsText: true} }

// Missing returns a number cell for a value that does not exist, such as
// a load that is never reached, shown as "—".
func Missing(unit string) Cell { return Cell{Value: math.NaN(), Unit: unit} }

// Field is a picture of a nodal field over the mesh, coloured cell by
// cell with the mean of the cell's node values.
type Field struct {
	Caption string       // e.g. "von Mises stress at the peak load, Z = 512 kN"
	Name    string       // quantity in plain words, e.g. "von Mises stress"
	Unit    string       // unit of Values, e.g. "MPa", or Dimensionless for a strain
	Nodes   [][2]float64 // node coordinates (x, z) [mm]; pass deformed coordinates to show the deformed shape
	Cells   [][]int      // node numbers per cell: 3 or 4 corners counter-clockwise, then for 6 or 8 nodes the midside nodes of sides 0-1, 1-2, …
	Values  []float64    // one value per node [Unit]
	View    *Box         // part of the section to show; nil: all of it
}

// Box is a rectangle of the x–z section [mm].
type Box struct {
	XMin, XMax, ZMin, ZMax float64
}

// JointDrawing is the drawing of the modelled section: region outlines,
// dimension lines and the bolt axis.
type JointDrawing struct {
	Caption    string
	Regions    []Region    // drawn in order, each with its own tint; see Outlines
	Dimensions []Dimension // dimension lines with labels
	BoltAxis   bool        // draw the bolt axis x = 0 as a chain line
	View       *Box        // part of the section to show; nil: all regions and dimensions
}

// Region is one named part of the section, such as "upper flange" or
// "bolt", as closed loops of (x, z) [mm]. Outer loops run
// counter-clockwise and holes clockwise.
type Region struct {
	Name  string
	Loops [][][2]float64
}

// Dimension is a dimension line between two points of the section,
// drawn parallel to From→To at Offset, with extension lines from the
// points and the label at its middle.
type Dimension struct {
	From, To [2]float64 // measured points (x, z) [mm]
	Label    string     // e.g. "t_f = 84 mm"
	Offset   float64    // distance of the dimension line from the points [mm], positive to the left of From→To
}

// Encode writes r as an HTML document to w.
func Encode(w io.Writer, r Report) error {
	if err := r.validate(); err != nil {
		return err
	}
	b, err := renderReport(r)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// Write writes r as an HTML document to path, replaced atomically. The
// whole document is rendered before the file is touched, so invalid
// input leaves no file behind.
func Write(path string, r Report) error {
	if err := r.validate(); err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	b, err := renderReport(r)
	if err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	return writeBytes(path, b)
}

// EncodeCompare writes c as an HTML document to w.
func EncodeCompare(w io.Writer, c Compare) error {
	if err := c.validate(); err != nil {
		return err
	}
	b, err := renderCompare(c)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// WriteCompare writes c as an HTML document to path, replaced
// atomically; see Write.
func WriteCompare(path string, c Compare) error {
	if err := c.validate(); err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	b, err := renderCompare(c)
	if err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	return writeBytes(path, b)
}

func writeBytes(path string, b []byte) error {
	return post.WriteFileAtomic(path, func(w io.Writer) error {
		_, err := io.Copy(w, bytes.NewReader(b))
		return err
	})
}
