package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"io/fs"
	"os"
	"path/filepath"

	"flangeseg/post"
	"flangeseg/post/results"
	"flangeseg/post/sweep/plan"
)

// Case statuses.
const (
	Finished = "finished" // ran to its end (exit 0)
	Stopped  = "stopped"  // the analysis stopped before its end (exit 3); results up to there
	Failed   = "failed"   // no results: the model could not be built or written (exit 2 or 3)
	Missing  = "missing"  // not run yet, interrupted, or run from another model
)

// RecordFile is the file in each case folder, written last, that says
// the case is done.
const RecordFile = "case.json"

// Record is case.json: what became of one case.
type Record struct {
	Index       int       `json:"index"`
	Name        string    `json:"name"`
	Values      []KeyText `json:"values"`
	ModelSHA256 string    `json:"model_sha256"` // of the case's model.resolved.toml
	Version     string    `json:"flangeseg"`
	Status      string    `json:"status"`
	ExitStatus  int       `json:"exit_status"`
	Ending      string    `json:"ending"`
	Reason      string    `json:"reason,omitempty"`
	Seconds     float64   `json:"time_s"` // wall-clock time of the case; the only value that differs between runs

	// Summary is the run's summary.json, when it wrote one.
	Summary *results.Summary `json:"-"`
}

// KeyText is a varied key and its value as a table shows it.
type KeyText struct {
	Key   string `json:"key"`
	Value string `json:"value"`
}

// caseDir is the folder of a case.
func caseDir(dir string, c plan.Case) string { return filepath.Join(dir, "cases", c.Name) }

// newRecord is a case's record before it runs.
func newRecord(c plan.Case) (Record, error) {
	h, err := modelHash(c)
	if err != nil {
		return Record{}, err
	}
	r := Record{Index: c.Index, Name: c.Name, ModelSHA256: h, Version: post.Version, Status: Missing}
	for _, s := range c.Set {
		r.Values = append(r.Values, KeyText{Key: s.Key, Value: plan.Text(s.Value)})
	}
	return r, nil
}

// modelHash is the SHA-256 of the case's resolved model, as its
// model.resolved.toml holds it.
func modelHash(c plan.Case) (string, error) {
	b, err := c.Spec.ResolvedTOML()
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:]), nil
}

// readRecord reads the record of a finished case; ok is false when the
// case has none, or one of another model or another flangeseg (then
// reason says which).
func readRecord(dir string, want Record) (r Record, ok bool, reason string, err error) {
	data, err := os.ReadFile(filepath.Join(dir, RecordFile))
	if errors.Is(err, fs.ErrNotExist) {
		return want, false, "not run yet, or interrupted", nil
	}
	if err != nil {
		return want, false, "", err
	}
	if err := json.Unmarshal(data, &r); err != nil {
		return want, false, "", err
	}
	switch {
	case r.ModelSHA256 != want.ModelSHA256:
		return want, false, "its folder holds the result of another model (the plan or the base changed)", nil
	case r.Version != want.Version:
		return want, false, "its folder holds the result of flangeseg " + r.Version, nil
	}
	r.Values = want.Values // as the plan writes them now
	if s, err := results.ReadSummary(filepath.Join(dir, "summary.json")); err == nil {
		r.Summary = &s
	}
	return r, true, "", nil
}

func writeRecord(dir string, r Record) error {
	return post.WriteJSON(filepath.Join(dir, RecordFile), r)
}
