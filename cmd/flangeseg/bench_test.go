package main

import (
	"io"
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
