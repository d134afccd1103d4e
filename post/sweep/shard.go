package sweep

import (
	"fmt"
	"strconv"
	"strings"
)

// Shard is the I-th of N disjoint parts of a sweep (1 ≤ I ≤ N): the cases
// whose index i has (i − 1) mod N = I − 1. The zero Shard is the whole
// sweep.
type Shard struct{ I, N int }

// Whole reports whether the shard is the whole sweep.
func (s Shard) Whole() bool { return s.N <= 1 }

// Has reports whether the case of index i (from 1) is the shard's.
func (s Shard) Has(i int) bool { return s.Whole() || (i-1)%s.N == s.I-1 }

func (s Shard) String() string {
	if s.Whole() {
		return "the whole sweep"
	}
	return fmt.Sprintf("shard %d/%d", s.I, s.N)
}

// ParseShard reads "I/N".
func ParseShard(text string) (Shard, error) {
	a, b, ok := strings.Cut(text, "/")
	i, err1 := strconv.Atoi(strings.TrimSpace(a))
	n, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil || n < 1 || i < 1 || i > n {
		return Shard{}, fmt.Errorf("shard %q: write I/N with 1 ≤ I ≤ N, e.g. 2/4", text)
	}
	return Shard{I: i, N: n}, nil
}

// Environment variables that name a shard.
const (
	SlurmTaskID    = "SLURM_ARRAY_TASK_ID"    // this task's index in the array
	SlurmTaskCount = "SLURM_ARRAY_TASK_COUNT" // tasks in the array
	SlurmTaskMin   = "SLURM_ARRAY_TASK_MIN"   // the lowest index of the array
	SlurmTaskStep  = "SLURM_ARRAY_TASK_STEP"  // the step between indices
	JobIndex       = "JOB_COMPLETION_INDEX"   // a Kubernetes indexed Job's pod index, from 0
	ShardCount     = "FLANGESEG_SHARDS"       // the number of shards where the engine does not say it
)

// ShardFromEnv reads the shard of a batch array task: a Slurm array
// (SLURM_ARRAY_TASK_ID counted from SLURM_ARRAY_TASK_MIN in steps of
// SLURM_ARRAY_TASK_STEP, of SLURM_ARRAY_TASK_COUNT) or a Kubernetes
// indexed Job (JOB_COMPLETION_INDEX from 0, of count shards; count 0
// takes FLANGESEG_SHARDS). ok is false when neither engine is there.
func ShardFromEnv(getenv func(string) string, count int) (s Shard, ok bool, err error) {
	if id := getenv(SlurmTaskID); id != "" {
		return slurmShard(getenv, id)
	}
	idx := getenv(JobIndex)
	if idx == "" {
		return Shard{}, false, nil
	}
	i, err := strconv.Atoi(idx)
	if err != nil || i < 0 {
		return Shard{}, true, fmt.Errorf("%s = %q: not an index from 0", JobIndex, idx)
	}
	if count == 0 {
		c := getenv(ShardCount)
		if c == "" {
			return Shard{}, true, fmt.Errorf("%s = %d but the number of shards is not given: pass --shards N (the Job's completions) or set %s", JobIndex, i, ShardCount)
		}
		if count, err = strconv.Atoi(c); err != nil || count < 1 {
			return Shard{}, true, fmt.Errorf("%s = %q: not a number of shards ≥ 1", ShardCount, c)
		}
	}
	if i >= count {
		return Shard{}, true, fmt.Errorf("%s = %d is not below the number of shards %d", JobIndex, i, count)
	}
	return Shard{I: i + 1, N: count}, true, nil
}

func slurmShard(getenv func(string) string, id string) (Shard, bool, error) {
	num := func(name string, def int) (int, error) {
		v := getenv(name)
		if v == "" {
			return def, nil
		}
		n, err := strconv.Atoi(v)
		if err != nil {
			return 0, fmt.Errorf("%s = %q: not a whole number", name, v)
		}
		return n, nil
	}
	i, err := num(SlurmTaskID, 0)
	if err != nil {
		return Shard{}, true, err
	}
	count, err := num(SlurmTaskCount, 0)
	if err != nil {
		return Shard{}, true, err
	}
	lo, err := num(SlurmTaskMin, 0)
	if err != nil {
		return Shard{}, true, err
	}
	step, err := num(SlurmTaskStep, 1)
	if err != nil {
		return Shard{}, true, err
	}
	if count < 1 || step < 1 {
		return Shard{}, true, fmt.Errorf("%s = %s with %s = %d and %s = %d: the array's size is not known", SlurmTaskID, id, SlurmTaskCount, count, SlurmTaskStep, step)
	}
	k := (i - lo) / step
	if (i-lo)%step != 0 || k < 0 || k >= count {
		return Shard{}, true, fmt.Errorf("%s = %d is not one of %d indices from %d in steps of %d: give the array a plain range (--array=0-%d) or pass --shard I/N", SlurmTaskID, i, count, lo, step, count-1)
	}
	return Shard{I: k + 1, N: count}, true, nil
}
