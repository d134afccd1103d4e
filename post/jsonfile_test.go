package post

import (
	"bytes"
	"encoding/json"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

type jsonSummary struct {
	Title      string             `json:"title"`
	PeakLoadKN float64            `json:"peak_load_kN"`
	Location   string             `json:"failure_location"`
	Hand       map[string]float64 `json:"hand_methods_kN"`
	Increments []int              `json:"increments"`
}

func TestWriteJSON(t *testing.T) {
	in := jsonSummary{
		Title:      "M36 <recess> & taper",
		PeakLoadKN: Round10(857.1234567891234),
		Location:   "bolt thread",
		Hand:       map[string]float64{"mode_C": 910.5, "mode_A": 1200, "mode_B": 980.25},
		Increments: []int{1, 2, 3},
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "summary.json")
	if err := WriteJSON(path, in); err != nil {
		t.Fatal(err)
	}
	noTempFiles(t, dir)
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out jsonSummary
	if err := json.Unmarshal(b, &out); err != nil {
		t.Fatalf("does not parse back: %v", err)
	}
	if !reflect.DeepEqual(in, out) {
		t.Errorf("read back %+v, want %+v", out, in)
	}
	s := string(b)
	if !strings.HasSuffix(s, "}\n") {
		t.Errorf("no trailing newline: %q", s[len(s)-3:])
	}
	if !strings.Contains(s, "\n  \"title\": \"M36 <recess> & taper\",\n") {
		t.Errorf("not indented by two spaces, or HTML-escaped:\n%s", s)
	}
	a, bb, c := strings.Index(s, "mode_A"), strings.Index(s, "mode_B"), strings.Index(s, "mode_C")
	if !(a < bb && bb < c) {
		t.Errorf("map keys not sorted:\n%s", s)
	}
	if !strings.Contains(s, "857.1234568") {
		t.Errorf("rounded value not written as 857.1234568:\n%s", s)
	}
	var again bytes.Buffer
	if err := EncodeJSON(&again, in); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(again.Bytes(), b) {
		t.Error("EncodeJSON differs from the file WriteJSON wrote")
	}
}

func TestWriteJSONErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		v    any
	}{
		{"NaN", map[string]float64{"peak": math.NaN()}},
		{"Inf", []float64{1, math.Inf(1)}},
		{"channel", struct{ C chan int }{make(chan int)}},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "bad.json")
			err := WriteJSON(path, c.v)
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), path) {
				t.Errorf("error %q does not name the path", err)
			}
			if _, err := os.Stat(path); !os.IsNotExist(err) {
				t.Error("file written despite the error")
			}
			noTempFiles(t, dir)
			var buf bytes.Buffer
			if err := EncodeJSON(&buf, c.v); err == nil || buf.Len() != 0 {
				t.Errorf("EncodeJSON: error %v, %d bytes written", err, buf.Len())
			}
		})
	}
}

func TestRound10(t *testing.T) {
	for _, c := range []struct {
		x, want float64
	}{
		{0.1 + 0.2, 0.3},
		{1.0 / 3, 0.3333333333},
		{-2.00000000004, -2},
		{123456789012, 123456789000},
		{6.02214076e23, 6.02214076e23},
		{1.23456789049e-9, 1.23456789e-9},
		{1.23456789051e-9, 1.234567891e-9},
		{5e-324, 5e-324},
		{math.MaxFloat64, math.MaxFloat64}, // rounds past the largest float: kept
		{0, 0},
		{math.Inf(-1), math.Inf(-1)},
	} {
		if got := Round10(c.x); got != c.want {
			t.Errorf("Round10(%v) = %v, want %v", c.x, got, c.want)
		}
	}
	if !math.IsNaN(Round10(math.NaN())) {
		t.Error("Round10(NaN) is not NaN")
	}
	if got := Round10(math.Copysign(0, -1)); got != 0 || !math.Signbit(got) {
		t.Errorf("Round10(-0) = %v, want -0", got)
	}
	// Any value: at most 10 significant digits, off by at most half a unit
	// in the 10th digit, and idempotent.
	r := rand.New(rand.NewPCG(1, 2))
	for range 10000 {
		x := (r.Float64() - 0.5) * math.Pow(10, float64(r.IntN(40)-20))
		got := Round10(x)
		mant := strings.TrimLeft(strings.Split(strconv.FormatFloat(math.Abs(got), 'e', -1, 64), "e")[0], "0")
		if n := len(strings.ReplaceAll(mant, ".", "")); n > 10 {
			t.Fatalf("Round10(%v) = %v has %d digits", x, got, n)
		}
		if math.Abs(got-x) > 0.5e-9*math.Abs(x)*(1+1e-6) {
			t.Fatalf("Round10(%v) = %v: off by %v", x, got, got-x)
		}
		if Round10(got) != got {
			t.Fatalf("Round10 not idempotent at %v", got)
		}
	}
}

func BenchmarkEncodeJSON(b *testing.B) {
	v := jsonSummary{Title: "bench", Hand: map[string]float64{"a": 1, "b": 2, "c": 3}}
	for i := range 1000 {
		v.Increments = append(v.Increments, i)
	}
	b.ReportAllocs()
	for b.Loop() {
		if err := EncodeJSON(io.Discard, v); err != nil {
			b.Fatal(err)
		}
	}
}
