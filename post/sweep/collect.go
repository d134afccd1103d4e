package sweep

import (
	"fmt"

	"flangeseg/post/sweep/plan"
)

// Collect reads the records of every case from dir/cases, in case order.
// A case without a record of its model is Missing, with the reason.
func Collect(dir string, cases []plan.Case) ([]Record, error) {
	recs := make([]Record, len(cases))
	for i, c := range cases {
		want, err := newRecord(c)
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %w", c.Index, c.Name, err)
		}
		r, ok, reason, err := readRecord(caseDir(dir, c), want)
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %s: %w", c.Index, c.Name, RecordFile, err)
		}
		if !ok {
			r.Reason = reason
		}
		recs[i] = r
	}
	return recs, nil
}

// Tally counts the records by status.
type Tally struct {
	Finished int `json:"finished"`
	Stopped  int `json:"stopped"`
	Failed   int `json:"failed"`
	Missing  int `json:"missing"`
}

// Count tallies records.
func Count(recs []Record) Tally {
	var t Tally
	for _, r := range recs {
		switch r.Status {
		case Finished:
			t.Finished++
		case Stopped:
			t.Stopped++
		case Failed:
			t.Failed++
		default:
			t.Missing++
		}
	}
	return t
}

// AllFinished reports whether every case ran to its end.
func (t Tally) AllFinished() bool { return t.Stopped+t.Failed+t.Missing == 0 }

func (t Tally) String() string {
	return fmt.Sprintf("%d finished, %d stopped early, %d failed, %d missing", t.Finished, t.Stopped, t.Failed, t.Missing)
}
