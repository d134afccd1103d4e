package report

import (
	"io"
	"testing"
)

// BenchmarkEncode writes the example note: about 2300 cells drawn twice,
// four curves, one contact-pressure chart.
func BenchmarkEncode(b *testing.B) {
	r := exampleReport()
	b.ReportAllocs()
	for b.Loop() {
		if err := Encode(io.Discard, r); err != nil {
			b.Fatal(err)
		}
	}
}
