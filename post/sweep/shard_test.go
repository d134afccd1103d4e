package sweep

import (
	"strings"
	"testing"
)

func TestParseShard(t *testing.T) {
	for _, tc := range []struct {
		text string
		want Shard
		ok   bool
	}{
		{"1/4", Shard{1, 4}, true},
		{"4/4", Shard{4, 4}, true},
		{" 2 / 3 ", Shard{2, 3}, true},
		{"1/1", Shard{1, 1}, true},
		{"0/4", Shard{}, false},
		{"5/4", Shard{}, false},
		{"2/0", Shard{}, false},
		{"3", Shard{}, false},
		{"a/b", Shard{}, false},
	} {
		got, err := ParseShard(tc.text)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("ParseShard(%q) = %v, %v; want %v, ok %v", tc.text, got, err, tc.want, tc.ok)
		}
	}
}

// The shards of a sweep are disjoint and cover every case.
func TestShardsPartition(t *testing.T) {
	for n := 1; n <= 5; n++ {
		for i := 1; i <= 23; i++ {
			owners := 0
			for k := 1; k <= n; k++ {
				if (Shard{k, n}).Has(i) {
					owners++
				}
			}
			if owners != 1 {
				t.Errorf("case %d is in %d of %d shards, want 1", i, owners, n)
			}
		}
	}
	if !(Shard{}).Has(7) {
		t.Error("the whole sweep does not have case 7")
	}
}

func TestShardFromEnv(t *testing.T) {
	for _, tc := range []struct {
		name  string
		env   map[string]string
		count int
		want  Shard
		found bool
		err   string
	}{
		{"nothing", nil, 0, Shard{}, false, ""},
		{"slurm from 0", map[string]string{SlurmTaskID: "2", SlurmTaskCount: "4", SlurmTaskMin: "0"}, 0, Shard{3, 4}, true, ""},
		{"slurm from 1", map[string]string{SlurmTaskID: "1", SlurmTaskCount: "4", SlurmTaskMin: "1"}, 0, Shard{1, 4}, true, ""},
		{"slurm with a step", map[string]string{SlurmTaskID: "6", SlurmTaskCount: "4", SlurmTaskMin: "0", SlurmTaskStep: "2"}, 0, Shard{4, 4}, true, ""},
		{"slurm off the step", map[string]string{SlurmTaskID: "3", SlurmTaskCount: "4", SlurmTaskMin: "0", SlurmTaskStep: "2"}, 0, Shard{}, true, "not one of 4 indices"},
		{"slurm without a count", map[string]string{SlurmTaskID: "3"}, 0, Shard{}, true, "size is not known"},
		{"slurm before kubernetes", map[string]string{SlurmTaskID: "0", SlurmTaskCount: "2", JobIndex: "1"}, 0, Shard{1, 2}, true, ""},
		{"kubernetes with --shards", map[string]string{JobIndex: "0"}, 3, Shard{1, 3}, true, ""},
		{"kubernetes with the variable", map[string]string{JobIndex: "4", ShardCount: "5"}, 0, Shard{5, 5}, true, ""},
		{"kubernetes without a count", map[string]string{JobIndex: "1"}, 0, Shard{}, true, "--shards N"},
		{"kubernetes past the count", map[string]string{JobIndex: "3"}, 3, Shard{}, true, "not below the number of shards 3"},
		{"kubernetes not a number", map[string]string{JobIndex: "x"}, 3, Shard{}, true, "not an index"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, found, err := ShardFromEnv(func(k string) string { return tc.env[k] }, tc.count)
			if got != tc.want || found != tc.found {
				t.Errorf("got %v (found %v), want %v (found %v)", got, found, tc.want, tc.found)
			}
			switch {
			case tc.err == "" && err != nil:
				t.Errorf("error %v", err)
			case tc.err != "" && (err == nil || !strings.Contains(err.Error(), tc.err)):
				t.Errorf("error %v, want one saying %q", err, tc.err)
			}
		})
	}
}
