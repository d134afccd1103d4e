package report_test

import (
	"bytes"
	"fmt"
	"strings"

	"flangeseg/post"
	"flangeseg/post/report"
)

// A one-run note with a few inputs, the preload, one curve and the
// hand-versus-FE table. Sections without data say so.
func ExampleEncode() {
	r := report.Report{
		Title:     "Tower joint T3 — defined contact bands",
		Model:     "t3-bands.toml",
		Generated: "flangeseg 0.4.0",
		Caution:   "flangeseg is a design aid: check its results against the governing codes (e.g. EN 1993-1-8, EN 1993-1-9) and have them signed off under local codes and licensed engineering practice.",
		Inputs: []report.Quantities{{Caption: "Flange", Rows: []report.Quantity{
			{Symbol: "t_f", Name: "flange thickness", Value: report.Num(84, "mm"), Source: "model file"},
			{Symbol: "a", Name: "bolt axis to flange free edge", Value: report.Num(72, "mm"), Source: "model file"},
			{Name: "material", Value: report.Text("S355"), Source: "model file"},
		}}},
		Preload: report.Quantities{Caption: "Preload", Rows: []report.Quantity{
			{Symbol: "F_p,C", Name: "target preload 0.7·f_ub·A_s", Value: report.Num(784.6, "kN"), Source: "EN 1993-1-8, 3.9"},
			{Symbol: "F_p", Name: "preload reached", Value: report.NumDigits(784.63, "kN", 5), Source: "FE, this run"},
		}},
		Curves: []post.Plot{{Title: "Bolt force against segment force", XLabel: "Z [kN]", YLabel: "F_s [kN]",
			Series: []post.Series{{Name: "FE", X: []float64{0, 220, 410}, Y: []float64{784.6, 795.6, 1076}}}}},
		HandVersusFE: report.Table{
			Caption: "Ultimate segment force",
			Columns: []report.Column{{Heading: "method"}, {Heading: "ultimate segment force", Unit: "kN"}, {Heading: "FE / method", Unit: report.Dimensionless}},
			Rows: [][]report.Cell{
				{report.Text("FE, this run"), report.Num(410, ""), report.Num(1, "")},
				{report.Text("plastic hinges, M–N (Seidel 2001)"), report.Num(438.6, ""), report.Num(410/438.6, "")},
			},
			Source: "FE: this run; hand method: post/handcalc",
		},
		Results: report.Quantities{Caption: "Joint figures", Rows: []report.Quantity{
			{Symbol: "Z_open", Name: "opening load", Value: report.Missing("kN"), Source: "FE, this run: not reached"},
		}},
	}
	var b bytes.Buffer
	if err := report.Encode(&b, r); err != nil {
		fmt.Println(err)
		return
	}
	page := b.String()
	fmt.Println(strings.Contains(page, "<td class=\"value\">784.63</td>"))
	fmt.Println(strings.Count(page, "flangeseg is a design aid"))
	// Output:
	// true
	// 2
}
