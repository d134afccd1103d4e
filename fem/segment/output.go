package segment

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"flangeseg/contact"
	"flangeseg/fem/segment/figures"
	"flangeseg/post"
	"flangeseg/post/handcalc"
)

// historyTable lays out history.csv (column names of DESIGN.md).
func historyTable(g *segment, res *analysis) (post.Table, error) {
	cols := []string{"increment", "stage", "Z_kN", "u_mm", "bolt_force_kN", "bolt_moment_interface_kNm",
		"bolt_moment_head_kNm", "bolt_stress_axial_MPa", "bolt_stress_bending_MPa", "gap_edge_mm"}
	for _, z := range g.zones {
		cols = append(cols, "contact_force_"+z.name+"_kN")
	}
	cols = append(cols, "max_plastic_strain", "max_damage", "iterations")
	t := post.Table{Columns: cols}
	// Bending stress on the stress-area section: W = π·d_s³/32 with
	// d_s = √(4·A_s/π).
	ds := math.Sqrt(4 * g.der.StressArea / math.Pi)
	w := math.Pi * ds * ds * ds / 32
	for _, r := range res.rows {
		stage := 1.0
		if r.Stage == "preload" {
			stage = 0
		}
		row := []float64{float64(r.Increment), stage, r.Z / 1e3, r.U, r.Fs / 1e3, r.MomentInterface / 1e6,
			r.MomentHead / 1e6, r.Fs / g.der.StressArea, math.Abs(r.MomentInterface) / w, r.GapEdge}
		for _, f := range r.ZoneForce {
			row = append(row, f/1e3)
		}
		row = append(row, r.MaxPlastic, r.MaxDamage, float64(r.Iterations))
		if err := t.Append(row...); err != nil {
			return t, err
		}
	}
	return t, nil
}

// summary is summary.json.
type summary struct {
	Title     string            `json:"title"`
	Model     string            `json:"model"`
	Caution   string            `json:"caution"`
	Converged bool              `json:"converged"`
	Ending    string            `json:"ending"`
	Failure   string            `json:"failure,omitempty"`
	Joint     figures.Joint     `json:"joint"`
	Mesh      meshSummary       `json:"mesh"`
	Solver    solverSummary     `json:"solver"`
	Hand      handcalc.Results  `json:"hand_methods"`
	Verdict   *handcalc.Verdict `json:"verdict,omitempty"` // with [load] design_force
}

type meshSummary struct {
	Nodes            int     `json:"nodes"`
	Elements         int     `json:"elements"`
	Equations        int     `json:"equations"`
	Element          string  `json:"element"`
	MinJacobianRatio float64 `json:"min_jacobian_ratio"`
	MaxAspectRatio   float64 `json:"max_aspect_ratio"`
}

type solverSummary struct {
	Increments         int     `json:"increments"`
	NewtonIterations   int     `json:"newton_iterations"`
	Factorizations     int     `json:"factorizations"`
	AssemblySeconds    float64 `json:"assembly_s"`
	ContactSeconds     float64 `json:"contact_s"`
	FactorSeconds      float64 `json:"factorization_s"`
	SolveSeconds       float64 `json:"solve_s"`
	KrylovSteps        int     `json:"krylov_steps"`
	AnalysisSeconds    float64 `json:"ordering_s"`
	PenaltyMPaPerMM    float64 `json:"contact_penalty_MPa_per_mm"`
	PreloadSolves      int     `json:"preload_solves"`
	FieldStatesWritten int     `json:"field_states"`
}

func makeSummary(path string, g *segment, res *analysis) summary {
	q := g.mesh.Quality()
	s := summary{
		Title: g.spec.Title, Model: filepath.Base(path), Caution: caution,
		Converged: res.failure == nil, Ending: res.ending, Joint: jointFigures(g, res), Hand: g.hand,
		Verdict: handcalc.CheckDesignForce(g.hand, g.spec.Load.DesignForce, handcalc.DefaultBorderline),
		Mesh: meshSummary{Nodes: len(g.mesh.Nodes), Elements: len(g.mesh.Elements), Equations: res.equation,
			Element: g.spec.Mesh.Element, MinJacobianRatio: q.MinJacobianRatio, MaxAspectRatio: q.MaxAspectRatio},
		Solver: solverSummary{Increments: len(res.rows) - 1, NewtonIterations: res.timing.Iterations,
			Factorizations: res.timing.Factorizations, AssemblySeconds: res.timing.Assembly.Seconds(),
			ContactSeconds: res.timing.Contact.Seconds(), FactorSeconds: res.timing.Factorization.Seconds(),
			SolveSeconds: res.timing.Solve.Seconds(), KrylovSteps: res.timing.KrylovSteps,
			AnalysisSeconds: res.timing.Analysis.Seconds(), PenaltyMPaPerMM: g.penalty,
			PreloadSolves: res.preload.Iterations, FieldStatesWritten: len(res.states)},
	}
	if res.failure != nil {
		s.Failure = res.failure.Error()
	}
	return s
}

// writeResults writes every output file of a run into dir.
func writeResults(dir, modelPath string, text []byte, g *segment, res *analysis) (summary, error) {
	sum := makeSummary(modelPath, g, res)
	if err := os.MkdirAll(filepath.Join(dir, "fields"), 0o755); err != nil {
		return sum, err
	}
	resolved, err := g.spec.ResolvedTOML()
	if err != nil {
		return sum, err
	}
	if err := post.WriteFileAtomic(filepath.Join(dir, "model.resolved.toml"), func(w io.Writer) error {
		_, err := w.Write(resolved)
		return err
	}); err != nil {
		return sum, err
	}
	t, err := historyTable(g, res)
	if err != nil {
		return sum, err
	}
	if err := post.WriteCSV(filepath.Join(dir, "history.csv"), t); err != nil {
		return sum, err
	}
	if err := post.WriteJSON(filepath.Join(dir, "summary.json"), sum); err != nil {
		return sum, err
	}
	if err := writeRunReport(dir, modelPath, text, g, res, sum); err != nil {
		return sum, err
	}
	if err := writePlots(dir, g, res); err != nil {
		return sum, err
	}
	return sum, writeFields(dir, res)
}

func column(rows []figures.Row, q func(figures.Row) float64) []float64 {
	out := make([]float64, len(rows))
	for i, r := range rows {
		out[i] = q(r)
	}
	return out
}

// curveFiles name the files of the curves of noteCurves, in its order.
var curveFiles = []string{"Z_u", "Fs_Z", "Ms_Z", "gap_Z", "contact_force_Z"}

func writePlots(dir string, g *segment, res *analysis) error {
	curves := noteCurves(g, res.rows, jointFigures(g, res))
	if curves == nil {
		return nil
	}
	for i, name := range curveFiles {
		if err := post.WritePlot(filepath.Join(dir, name), curves[i]); err != nil {
			return err
		}
	}
	return post.WritePlot(filepath.Join(dir, "contact_pressure"), pressurePlot(res))
}

// peakMarker marks the largest segment force of the run.
func peakMarker(rows []figures.Row) []post.Marker {
	best := 0
	for i, r := range rows {
		if r.Z > rows[best].Z {
			best = i
		}
	}
	r := rows[best]
	return []post.Marker{{Name: fmt.Sprintf("peak %.0f kN", r.Z/1e3), X: r.U, Y: r.Z / 1e3}}
}

// pressurePlot draws the face pressure at preload and at three load
// levels (a quarter, half and all of the way).
func pressurePlot(res *analysis) post.Plot {
	p := post.Plot{Title: "Contact pressure along the flange face", XLabel: "x [mm]", YLabel: "p [MPa]"}
	n := len(res.states)
	picks := []int{0}
	for _, f := range []float64{0.25, 0.5, 1} {
		i := int(math.Round(f * float64(n-1)))
		if i > picks[len(picks)-1] {
			picks = append(picks, i)
		}
	}
	for _, i := range picks {
		st := res.states[i]
		var x, pr []float64
		for _, r := range st.contacts["faces"] {
			if r.Paired {
				x, pr = append(x, r.X), append(pr, r.Pressure)
			}
		}
		p.Series = append(p.Series, post.Series{Name: fmt.Sprintf("%s, Z = %.0f kN", st.label, st.row.Z/1e3), X: x, Y: pr})
	}
	return p
}

// writeFields writes one .vtu per kept state and the fields.pvd series.
func writeFields(dir string, res *analysis) error {
	var series []post.SeriesEntry
	for i, st := range res.states {
		point, cell, err := post.SolutionFields(st.solution)
		if err != nil {
			return err
		}
		point = append(point, contactFields(len(st.solution.Model().Mesh().Nodes), st.contacts)...)
		cell = append(cell, historyFields(st.history, len(st.solution.Model().Mesh().Elements))...)
		name := fmt.Sprintf("state_%03d.vtu", i)
		mesh := st.solution.Model().Mesh()
		if err := post.WriteVTU(filepath.Join(dir, "fields", name), post.GridFromMesh(mesh), point, cell); err != nil {
			return err
		}
		series = append(series, post.SeriesEntry{Time: float64(st.row.Increment), File: filepath.Join("fields", name)})
	}
	return post.WritePVD(filepath.Join(dir, "fields.pvd"), series)
}

// historyFields are the cell means of equivalent plastic strain and damage
// indicator over each element's integration points (zero where elastic).
func historyFields(h pointScalars, cells int) []post.Field {
	plastic, damage := make([]float64, cells), make([]float64, cells)
	for e := range h.plastic {
		if n := len(h.plastic[e]); n > 0 {
			for ip := range h.plastic[e] {
				plastic[e] += h.plastic[e][ip] / float64(n)
				damage[e] += h.damage[e][ip] / float64(n)
			}
		}
	}
	return []post.Field{{Name: "plastic_strain", Components: 1, Values: plastic}, {Name: "damage", Components: 1, Values: damage}}
}

// contactFields carries contact pressure and gap to point data (zero away
// from the contact surfaces; each surface's slave nodes carry its values).
func contactFields(nodes int, pairs map[string][]contact.NodeResult) []post.Field {
	pressure := make([]float64, nodes)
	gap := make([]float64, nodes)
	for _, name := range []string{"faces", "head", "nut"} {
		for _, r := range pairs[name] {
			if r.Paired { // an unpaired node has no gap (it faces nothing)
				pressure[r.Node], gap[r.Node] = r.Pressure, r.Gap
			}
		}
	}
	return []post.Field{{Name: "contact_pressure", Components: 1, Values: pressure}, {Name: "gap", Components: 1, Values: gap}}
}

// ReadHistoryColumns reads the numeric columns of a run's history.csv.
func ReadHistoryColumns(path string) (map[string][]float64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	records, err := csv.NewReader(f).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if len(records) < 2 {
		return nil, fmt.Errorf("%s: no rows", path)
	}
	cols := map[string][]float64{}
	for _, r := range records[1:] {
		for c, name := range records[0] {
			if c >= len(r) {
				continue
			}
			if v, err := strconv.ParseFloat(r[c], 64); err == nil {
				cols[name] = append(cols[name], v)
			}
		}
	}
	for _, need := range []string{"Z_kN", "u_mm", "bolt_force_kN"} {
		if len(cols[need]) != len(records)-1 {
			return nil, fmt.Errorf("%s: column %s missing or incomplete", path, need)
		}
	}
	return cols, nil
}
