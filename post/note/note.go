package note

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"path/filepath"
	"strings"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
	"flangeseg/post/report"
	"flangeseg/post/results"
)

// This file fills the calculation note, report.html (package post/report),
// of a run and of a comparison. A run's note is built from the analysis in
// memory; a comparison rebuilds each run's note from its run directory
// (history.csv, summary.json) and the model, so it needs no analysis in
// memory. Field pictures and contact pressures need the solution and stay
// in each run's own note.

// Sources as the notes name them.
const (
	srcFE      = "FE, this run"
	srcFile    = "model file"
	srcDerived = "derived from the model file"
	srcHand    = "post/handcalc"
)

// WriteRun writes dir/report.html, the calculation note of one run of the
// model file at path (text: the model's text when it is not on disk at
// path, as for the embedded demo models; else nil), replaced atomically.
// sum is the run's summary (package results).
func WriteRun(dir, path string, text []byte, res *segment.Result, sum results.Summary) error {
	n := runNote{path: path, text: text, seg: res.Segment, rows: res.History, sum: sum}
	r, err := n.report()
	if err != nil {
		return err
	}
	r.ContactPressure = notePressure(res)
	fields, err := noteFields(res)
	if err != nil {
		return fmt.Errorf("report: field pictures: %w", err)
	}
	r.Fields = fields
	return report.Write(filepath.Join(dir, "report.html"), r)
}

// runNote is what the note of one run is built from.
type runNote struct {
	path string // the model file as the user named it
	text []byte // the model's text when it is not on disk at path, else nil
	seg  *segment.Segment
	rows []figures.Row
	sum  results.Summary
}

func (n *runNote) report() (report.Report, error) {
	s := n.seg.Spec()
	joint, err := jointDrawing(s, n.seg.Mesh())
	if err != nil {
		return report.Report{}, err
	}
	h, err := resolvedHash(s)
	if err != nil {
		return report.Report{}, err
	}
	title := s.Title
	if strings.TrimSpace(title) == "" {
		title = filepath.Base(n.path)
	}
	return report.Report{
		Title:        title,
		Model:        filepath.Base(n.path),
		Generated:    fmt.Sprintf("flangeseg %s; model.resolved.toml sha256 %s", post.Version, h),
		Caution:      post.Caution,
		Joint:        joint,
		Inputs:       append(n.inputs(), n.derived()),
		Preload:      n.preload(),
		Results:      n.results(),
		Curves:       results.Curves(n.seg, n.rows, n.sum.Joint),
		HandVersusFE: n.handVersusFE(),
		Convergence:  n.convergence(),
		Notes:        n.notes(),
	}, nil
}

// resolvedHash is the start of the SHA-256 of the resolved model: it
// names the input exactly without reading a clock or the file system.
func resolvedHash(s *modelfile.Spec) (string, error) {
	b, err := s.ResolvedTOML()
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:8]), nil
}
