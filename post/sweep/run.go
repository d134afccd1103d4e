package sweep

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"time"

	"flangeseg/fem/segment"
	"flangeseg/post"
	"flangeseg/post/note"
	"flangeseg/post/results"
	"flangeseg/post/sweep/plan"
)

// Options are the choices of a sweep run.
type Options struct {
	Dir   string // the sweep's folder: cases go into Dir/cases/NAME
	Jobs  int    // cases side by side; 0: runtime.GOMAXPROCS(0)
	Shard Shard  // the part to run; the zero Shard runs every case
	// AllFields keeps the fields of every increment, as a single run
	// does; else a case keeps those of the preload and of the last
	// increment (fields/ is most of a run directory: about 3 MB a state
	// for the demo joint).
	AllFields bool
	// Progress receives the tension increments done and planned over all
	// cases of this run (a case found done counts whole); it is called
	// from one goroutine at a time.
	Progress func(done, all int)
	// CaseDone receives the record of each case as it is found done or
	// ends, one call at a time.
	CaseDone func(r Record, ran bool)
}

// Run runs the cases of opt.Shard that are not done yet, opt.Jobs at a
// time, and returns the records of the shard's cases in order. A case
// that fails is recorded and the others go on. When ctx ends, the cases
// running are left without a record (Missing) and run again next time;
// Run then returns ctx's error with the records.
func Run(ctx context.Context, cases []plan.Case, opt Options) ([]Record, error) {
	jobs := opt.Jobs
	if jobs <= 0 {
		jobs = runtime.GOMAXPROCS(0)
	}
	var mine []plan.Case
	for _, c := range cases {
		if opt.Shard.Has(c.Index) {
			mine = append(mine, c)
		}
	}
	t := newTracker(mine, opt)
	recs := make([]Record, len(mine))
	var todo []int
	for i, c := range mine {
		want, err := newRecord(c)
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %w", c.Index, c.Name, err)
		}
		r, done, _, err := readRecord(caseDir(opt.Dir, c), want)
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %w", c.Index, c.Name, err)
		}
		recs[i] = r
		if done {
			t.finish(i, r, false)
			continue
		}
		todo = append(todo, i)
	}
	work := make(chan int)
	var wg sync.WaitGroup
	for range min(jobs, len(todo)) {
		wg.Go(func() {
			for i := range work {
				recs[i] = runCase(ctx, opt, mine[i], recs[i], func(n int) { t.step(i, n) })
				if recs[i].Status != Missing {
					t.finish(i, recs[i], true)
				}
			}
		})
	}
	for _, i := range todo {
		if ctx.Err() != nil {
			break
		}
		work <- i
	}
	close(work)
	wg.Wait()
	return recs, ctx.Err()
}

// tracker counts the increments done over the cases of a run.
type tracker struct {
	mu        sync.Mutex
	done, all []int
	opt       Options
}

func newTracker(cases []plan.Case, opt Options) *tracker {
	t := &tracker{done: make([]int, len(cases)), all: make([]int, len(cases)), opt: opt}
	for i, c := range cases {
		t.all[i] = c.Spec.Load.Increments
	}
	return t
}

func (t *tracker) step(i, n int) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.done[i] = n
	t.report()
}

func (t *tracker) finish(i int, r Record, ran bool) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.done[i] = t.all[i]
	if t.opt.CaseDone != nil {
		t.opt.CaseDone(r, ran)
	}
	t.report()
}

func (t *tracker) report() {
	if t.opt.Progress == nil {
		return
	}
	done, all := 0, 0
	for i := range t.done {
		done, all = done+t.done[i], all+t.all[i]
	}
	t.opt.Progress(done, all)
}

// runCase runs one case into its folder, from scratch, and writes its
// record last. A case interrupted by ctx gets no record.
func runCase(ctx context.Context, opt Options, c plan.Case, rec Record, step func(int)) Record {
	start := time.Now()
	folder := caseDir(opt.Dir, c)
	fail := func(status string, code int, err error) Record {
		rec.Status, rec.ExitStatus, rec.Reason = status, code, oneLine(err.Error())
		rec.Seconds = seconds(time.Since(start))
		if werr := writeRecord(folder, rec); werr != nil {
			rec.Status, rec.Reason = Missing, "its record could not be written: "+werr.Error()
		}
		return rec
	}
	// A folder without a matching record holds nothing worth keeping:
	// an interrupted run or the result of another model.
	if err := os.RemoveAll(folder); err != nil {
		rec.Reason = err.Error()
		return rec
	}
	modelPath := filepath.Join(folder, "model.toml")
	if err := os.MkdirAll(folder, 0o755); err != nil {
		rec.Reason = err.Error()
		return rec
	}
	if err := post.WriteFileAtomic(modelPath, func(w io.Writer) error { _, err := w.Write(c.Text); return err }); err != nil {
		return fail(Failed, 3, err)
	}
	seg, err := segment.Build(c.Spec)
	if err != nil {
		return fail(Failed, 2, fmt.Errorf("the model cannot be built: %w", err))
	}
	sopt := segment.Options{Progress: func(done, _ int) { step(done) }}
	if !opt.AllFields {
		sopt.Keep = func(int) bool { return false }
	}
	res, err := seg.Run(ctx, sopt)
	if ctx.Err() != nil {
		rec.Reason = "interrupted"
		return rec
	}
	if err != nil {
		return fail(Failed, 3, fmt.Errorf("analysis: %w", err))
	}
	sum, err := results.Write(folder, modelPath, res)
	if err == nil {
		err = note.WriteRun(folder, modelPath, c.Text, res, sum)
	}
	if err != nil {
		return fail(Failed, 3, fmt.Errorf("writing results: %w", err))
	}
	rec.Summary, rec.Ending, rec.Status = &sum, sum.Ending, Finished
	if res.Failure != nil {
		rec.Status, rec.ExitStatus, rec.Reason = Stopped, 3, oneLine(res.Failure.Error())
	}
	rec.Seconds = seconds(time.Since(start))
	if err := writeRecord(folder, rec); err != nil {
		rec.Status, rec.Reason = Missing, "its record could not be written: "+err.Error()
	}
	return rec
}

// seconds rounds a wall-clock time to milliseconds.
func seconds(d time.Duration) float64 { return float64(d.Milliseconds()) / 1e3 }

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }
