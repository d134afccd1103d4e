package sparse

import (
	"bytes"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func TestMatrixMarketRoundTrip(t *testing.T) {
	rnd := rand.New(rand.NewPCG(7, 8))
	m := randomSPD(40, 3, rnd)
	m.val[1] = math.Pi / 3 // no short decimal form
	m.val[2] = -1e-300
	var buf bytes.Buffer
	if err := WriteMatrixMarket(&buf, m); err != nil {
		t.Fatal(err)
	}
	text := buf.String()
	if !strings.HasPrefix(text, "%%MatrixMarket matrix coordinate real symmetric\n40 40 ") {
		t.Errorf("header: %q", text[:60])
	}
	got, err := ReadMatrixMarket(strings.NewReader(text))
	if err != nil {
		t.Fatal(err)
	}
	if !got.samePattern(m) {
		t.Fatal("pattern changed in the round trip")
	}
	for p := range m.val {
		if got.val[p] != m.val[p] {
			t.Fatalf("value %d: %v, want %v (bit-exact)", p, got.val[p], m.val[p])
		}
	}
	var again bytes.Buffer
	WriteMatrixMarket(&again, got)
	if again.String() != text {
		t.Error("second write differs from the first")
	}
}

func TestWriteVectorMarket(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteVectorMarket(&buf, []float64{1, 0.1, -2.5e-17}); err != nil {
		t.Fatal(err)
	}
	want := "%%MatrixMarket matrix array real general\n3 1\n1\n0.1\n-2.5e-17\n"
	if buf.String() != want {
		t.Errorf("got %q, want %q", buf.String(), want)
	}
}

func TestReadMatrixMarketErrors(t *testing.T) {
	tests := []struct{ name, in string }{
		{"empty", ""},
		{"general", "%%MatrixMarket matrix coordinate real general\n1 1 1\n1 1 1\n"},
		{"size", "%%MatrixMarket matrix coordinate real symmetric\n2 3 1\n1 1 1\n"},
		{"range", "%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n3 1 1\n"},
		{"count", "%%MatrixMarket matrix coordinate real symmetric\n2 2 2\n1 1 1\n"},
		{"value", "%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n1 1 x\n"},
	}
	for _, tt := range tests {
		if _, err := ReadMatrixMarket(strings.NewReader(tt.in)); err == nil {
			t.Errorf("%s: no error", tt.name)
		}
	}
	// Comments, upper-triangle entries and duplicates are accepted.
	m, err := ReadMatrixMarket(strings.NewReader("%%MatrixMarket matrix coordinate integer symmetric\n% note\n2 2 3\n1 2 4\n2 1 1\n2 2 3\n"))
	if err != nil {
		t.Fatal(err)
	}
	if m.At(1, 0) != 5 || m.At(0, 0) != 0 || m.At(1, 1) != 3 {
		t.Errorf("entries %v", m.val)
	}
}
