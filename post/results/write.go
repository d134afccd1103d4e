package results

import (
	"io"
	"os"
	"path/filepath"

	"flangeseg/fem/segment"
	"flangeseg/post"
)

// Write writes the output files of a run into dir, the model file at
// modelPath: model.resolved.toml, history.csv, summary.json, the plots
// (SVG and PNG) and the fields (fields/*.vtu, fields.pvd). The calculation
// note, report.html, is package post/note's.
func Write(dir, modelPath string, r *segment.Result) (Summary, error) {
	sum := NewSummary(modelPath, r)
	if err := os.MkdirAll(filepath.Join(dir, "fields"), 0o755); err != nil {
		return sum, err
	}
	resolved, err := r.Segment.Spec().ResolvedTOML()
	if err != nil {
		return sum, err
	}
	if err := post.WriteFileAtomic(filepath.Join(dir, "model.resolved.toml"), func(w io.Writer) error {
		_, err := w.Write(resolved)
		return err
	}); err != nil {
		return sum, err
	}
	t, err := HistoryTable(r)
	if err != nil {
		return sum, err
	}
	if err := post.WriteCSV(filepath.Join(dir, "history.csv"), t); err != nil {
		return sum, err
	}
	if err := post.WriteJSON(filepath.Join(dir, "summary.json"), sum); err != nil {
		return sum, err
	}
	if err := writePlots(dir, r); err != nil {
		return sum, err
	}
	return sum, writeFields(dir, r)
}
