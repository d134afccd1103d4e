package main

import (
	"bytes"
	"io"
	"path/filepath"
	"testing"
)

// BenchmarkDemoCommand is `flangeseg demo -o DIR` end to end: both
// variants side by side, every output file written.
func BenchmarkDemoCommand(b *testing.B) {
	for i := 0; i < b.N; i++ {
		if code := run([]string{"demo", "-o", b.TempDir()}, io.Discard, io.Discard); code != exitOK {
			b.Fatalf("demo exit code %d", code)
		}
	}
}

// BenchmarkRing120 is issue 17's speed target: the demo joint's ring of
// 120 bolts with the benchmark survey's 12 classes of imperfection
// (testdata/ring/bench_survey.csv), elastic service-range runs, the
// classes two side by side, with the demo loads' fatigue check of every
// bolt; the aim is under 3 minutes on 2 cores. Run it with -benchtime 1x.
func BenchmarkRing120(b *testing.B) {
	args := []string{"demo/flat.toml", "--survey", "../../testdata/ring/bench_survey.csv", "--loads", "demo/ring_loads.csv", "--jobs", "2"}
	for b.Loop() {
		out := filepath.Join(b.TempDir(), "ring")
		var stdout, stderr bytes.Buffer
		if code := run(append([]string{"ring", "-o", out}, args...), &stdout, &stderr); code != exitOK {
			b.Fatalf("exit %d\n%s\n%s", code, stdout.String(), stderr.String())
		}
	}
}
