package figures

import (
	"reflect"
	"testing"
)

func TestKeyRows(t *testing.T) {
	// A flat face: closed at preload, the corner opens in row 2, the shell
	// side loses contact in row 4, the peak is row 5, the run ends in row 6.
	flat := []Row{
		{Z: 0, ShellSide: 9e5},
		{Z: 1e5, ShellSide: 6e5},
		{Z: 2e5, GapEdge: 0.01, ShellSide: 3e5},
		{Z: 3e5, GapEdge: 0.05, ShellSide: 1e5},
		{Z: 4e5, GapEdge: 0.2},
		{Z: 4.5e5, GapEdge: 0.4},
		{Z: 4.2e5, GapEdge: 0.5},
	}
	// Open after the preload already, never decompressed, still rising.
	open := []Row{{Z: 0, GapEdge: 0.002, ShellSide: 9e5}, {Z: 1e5, GapEdge: 0.003, ShellSide: 8e5}, {Z: 2e5, GapEdge: 0.004, ShellSide: 7e5}}
	for _, c := range []struct {
		name string
		rows []Row
		want []int
	}{
		{"flat face", flat, []int{0, 2, 4, 5, 6}},
		{"open after preload", open, []int{0, 2}},
		{"preload only", flat[:1], []int{0}},
		{"none", nil, nil},
	} {
		if got := KeyRows(c.rows); !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
	// The rows agree with the loads Read interpolates: each lies just past it.
	j := curveFigures(flat, Joint{}, 0)
	if *j.OpeningLoadKN <= flat[1].Z/1e3 || *j.OpeningLoadKN > flat[2].Z/1e3 ||
		*j.DecompressionKN <= flat[3].Z/1e3 || *j.DecompressionKN > flat[4].Z/1e3 {
		t.Errorf("opening %g kN, decompression %g kN: not between the rows before and at the key rows", *j.OpeningLoadKN, *j.DecompressionKN)
	}
}
