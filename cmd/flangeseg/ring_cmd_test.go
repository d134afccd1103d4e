package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
)

// ringModel is the demo joint, coarse, for the ring tests.
func ringModel(t *testing.T, dir string) string {
	t.Helper()
	text, err := os.ReadFile("demo/flat.toml")
	if err != nil {
		t.Fatal(err)
	}
	s := strings.Replace(string(text), "size = 8\n", "size = 16\n", 1)
	s = strings.Replace(s, "increments = 40\n", "increments = 12\n", 1)
	path := filepath.Join(dir, "joint.toml")
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func ringFile(t *testing.T, path, text string) string {
	t.Helper()
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestRingBadInput(t *testing.T) {
	dir := t.TempDir()
	model := ringModel(t, dir)
	good := ringFile(t, filepath.Join(dir, "good.csv"), "bolt,gap_inner_mm,gap_outer_mm\n1,0,0\n")
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"no survey", []string{model}, "--survey: missing"},
		{"bad survey", []string{model, "--survey", ringFile(t, filepath.Join(dir, "bad.csv"), "bolt,gap_inner_mm,gap_outer_mm\n1,0,0\n121,0,0\n")},
			"line 3: bolt = 121: must be a whole number from 1 to 120"},
		{"bad loads", []string{model, "--survey", good, "--loads", ringFile(t, filepath.Join(dir, "l.csv"), "Z_range_kN,Z_mean_kN,cycles\n10,10,10\n")},
			"is not a tower layout"},
		{"bad directions", []string{model, "--survey", good, "--loads", ringFile(t, filepath.Join(dir, "l2.csv"), "moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles\n1000,1000,0,10\n"),
			"--directions", ringFile(t, filepath.Join(dir, "d.csv"), "direction_deg,share\n0,0.5\n90,0.4\n")}, "the shares sum to 0.9"},
		{"bad tolerance", []string{model, "--survey", good, "--gap-tolerance", "0"}, "--gap-tolerance = 0 mm: must be > 0"},
	} {
		t.Run(c.name, func(t *testing.T) {
			var out, errb bytes.Buffer
			out.Reset()
			code := run(append([]string{"ring", "-o", filepath.Join(dir, "out_"+strings.ReplaceAll(c.name, " ", "_"))}, c.args...), &out, &errb)
			if code != exitBadInput || !strings.Contains(errb.String(), c.want) {
				t.Errorf("exit %d, stderr %q; want exit 2 and %q", code, errb.String(), c.want)
			}
			if _, err := os.Stat(filepath.Join(dir, "out_"+strings.ReplaceAll(c.name, " ", "_"))); err == nil {
				t.Errorf("bad input left an output directory")
			}
		})
	}
}

func readRing(t *testing.T, dir string) map[int]map[string]string {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "ring.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	out := map[int]map[string]string{}
	for _, r := range rows[1:] {
		m := map[string]string{}
		for i, h := range rows[0] {
			m[h] = r[i]
		}
		n, _ := strconv.Atoi(m["bolt"])
		out[n] = m
	}
	return out
}

func value(t *testing.T, row map[string]string, col string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(row[col], 64)
	if err != nil {
		t.Fatalf("bolt %s: %s = %q: %v", row["bolt"], col, row[col], err)
	}
	return v
}

// TestRingChecks runs a coarse ring end to end: bolt 10 with a pure
// radial taper, bolt 40 alone in a parallel gap, bolts 60–66 in a long
// one, every other bolt flat. It checks that the flat bolts get the flat
// segment's own run and bolt 10 the run of the model with that taper (the
// same analysis as 'flangeseg run' of that model), and the published
// trend, as a common-practice check: a gap raises the bolt-force increase
// and the fatigue damage of the bolts in it, and the damage falls as the
// preload closes more of the gap (Jakubowski & Schmidt, Stahlbau 73
// (2004); Buchholz & Seidel, Steel Construction 16 (2023)).
func TestRingChecks(t *testing.T) {
	if testing.Short() {
		t.Skip("runs six coarse analyses")
	}
	dir := t.TempDir()
	model := ringModel(t, dir)
	survey := ringFile(t, filepath.Join(dir, "survey.csv"), `bolt,gap_inner_mm,gap_outer_mm
1,0,0
9,0,0
10,0.3,0
11,0,0
39,0,0
40,0.1,0.1
41,0,0
59,0,0
60,0.1,0.1
66,0.1,0.1
67,0,0
`)
	// Each bolt checked as the most loaded one: every bolt the same Z.
	loads := ringFile(t, filepath.Join(dir, "loads.csv"), `moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles
6000,15000,3000,1e6
20000,18000,3000,1e4
36000,20000,3000,100
`)
	// As on a batch cluster: two shards of the classes, then the tables
	// collected from their folders (the resumed run at the end checks that
	// they equal a whole run's).
	out := filepath.Join(dir, "ring")
	var stdout, stderr bytes.Buffer
	args := []string{"ring", model, "--survey", survey, "--loads", loads, "-o", out, "--spring-tolerance", "1"}
	for _, extra := range [][]string{{"--shard", "1/2"}, {"--shard", "2/2"}, {"--collect"}} {
		if code := run(append(slices.Clone(args), extra...), &stdout, &stderr); code != exitOK {
			t.Fatalf("%v: exit %d\n%s\n%s", extra, code, stdout.String(), stderr.String())
		}
		if extra[0] == "--shard" {
			if _, err := os.Stat(filepath.Join(out, "ring.csv")); err == nil {
				t.Fatalf("%v: a shard wrote ring.csv: only the collection may", extra)
			}
		}
	}
	bolts := readRing(t, out)
	if len(bolts) != 120 {
		t.Fatalf("%d bolts in ring.csv, want 120", len(bolts))
	}
	spec, err := modelfile.Load(model)
	if err != nil {
		t.Fatal(err)
	}
	flat, err := segment.Run(context.Background(), spec, segment.Options{})
	if err != nil || flat.Failure != nil {
		t.Fatalf("flat run: %v %v", err, flat.Failure)
	}
	tapered := *spec
	tapered.Contact.Taper = value(t, bolts[10], "taper_deg")
	w := spec.Flange.A + spec.Flange.B + spec.Shell.Thickness/2
	if want := math.Atan(0.3/(2*w)) * 180 / math.Pi; math.Abs(tapered.Contact.Taper-want) > 0.01 {
		t.Errorf("bolt 10: taper %g°, want %g° within the tolerance 0.02°", tapered.Contact.Taper, want)
	}
	taper, err := segment.Run(context.Background(), &tapered, segment.Options{})
	if err != nil || taper.Failure != nil {
		t.Fatalf("taper run: %v %v", err, taper.Failure)
	}
	for _, c := range []struct {
		bolt int
		res  *segment.Result
	}{{1, flat}, {100, flat}, {10, taper}} {
		row := bolts[c.bolt]
		pre := c.res.History[0]
		var clamp float64
		for _, f := range pre.ZoneForce {
			clamp += f
		}
		if got, want := value(t, row, "preload_kN"), pre.Fs/1e3; math.Abs(got-want) > 1e-6*want {
			t.Errorf("bolt %d: preload %g kN, run %g kN", c.bolt, got, want)
		}
		if got, want := value(t, row, "clamp_force_after_preload_kN"), clamp/1e3; math.Abs(got-want) > 1e-6*want {
			t.Errorf("bolt %d: clamp force %g kN, run %g kN", c.bolt, got, want)
		}
		if got, want := value(t, row, "decompression_load_kN"), *c.res.Figures.DecompressionKN; math.Abs(got-want) > 1e-6*want {
			t.Errorf("bolt %d: decompression load %g kN, run %g kN", c.bolt, got, want)
		}
	}
	// The trend (common practice, sources above).
	d := func(b int) float64 { return value(t, bolts[b], "damage_FE") }
	share := func(b int) float64 { return value(t, bolts[b], "preload_spent_share") }
	if !(share(40) > share(63) && share(63) > 0 && share(1) < 1e-6) {
		t.Errorf("preload spent on closing: bolt 40 (short gap) %g, bolt 63 (long gap) %g, bolt 1 (flat) %g: want the short gap's largest, the flat bolt's none", share(40), share(63), share(1))
	}
	if !(d(40) > d(1) && d(63) > d(1)) {
		t.Errorf("damage: bolt 40 (short gap) %g, bolt 63 (long gap) %g, flat bolt 1 %g: a gap must raise the damage", d(40), d(63), d(1))
	}
	if !(d(40) > d(63)) {
		t.Errorf("damage: bolt 40 %g (preload closes less of its gap) not above bolt 63 %g (closes more)", d(40), d(63))
	}
	var rj struct {
		Governing int    `json:"governing_bolt"`
		Caution   string `json:"caution"`
	}
	data, err := os.ReadFile(filepath.Join(out, "ring.json"))
	if err == nil {
		err = json.Unmarshal(data, &rj)
	}
	if err != nil || rj.Governing != 40 || rj.Caution == "" {
		t.Errorf("ring.json: governing bolt %d, caution %q (%v); want bolt 40 and the caution", rj.Governing, rj.Caution, err)
	}
	page, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil || !bytes.Contains(page, []byte("Governing bolt: 40")) || !bytes.Contains(page, []byte("design aid")) {
		t.Errorf("report.html does not name the governing bolt or lacks the caution (%v)", err)
	}
	// The damage around the ring also on a logarithmic scale: the gapped
	// bolts' damage is decades above the flat ones'.
	for _, f := range []string{"ring_damage.svg", "ring_damage_log.svg", "ring_damage_log.png"} {
		if _, err := os.Stat(filepath.Join(out, "plots", f)); err != nil {
			t.Errorf("missing plots/%s", f)
		}
	}
	for _, want := range []string{`aria-label="survey conventions"`, "gap_inner_mm", "gap_outer_mm", "0° · bolt 1"} {
		if !bytes.Contains(page, []byte(want)) {
			t.Errorf("report.html lacks the sketch of the survey's conventions (%q)", want)
		}
	}
	// Run again, whole: every class is found done, and the tables come out
	// the same as collected from the shards.
	before, _ := os.ReadFile(filepath.Join(out, "ring.csv"))
	stdout.Reset()
	stderr.Reset()
	if code := run(args, &stdout, &stderr); code != exitOK {
		t.Fatalf("again: exit %d\n%s", code, stderr.String())
	}
	after, _ := os.ReadFile(filepath.Join(out, "ring.csv"))
	if !bytes.Equal(before, after) || !strings.Contains(stderr.String(), "already done") {
		t.Errorf("the resumed ring check ran classes again or wrote another ring.csv")
	}
}
