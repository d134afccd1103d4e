package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/post/handcalc"
)

// The hand command on the demo with a design force: the verdict's
// utilisation is Z_Ed over the design-basis mechanism load it prints.
func TestHandCommand(t *testing.T) {
	data := strings.Replace(string(demoModels()[0].Data), "[load]\n", "[load]\ndesign_force = 480e3\n", 1)
	path := filepath.Join(t.TempDir(), "joint.toml")
	if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errOut bytes.Buffer
	if code := run([]string{"hand", path, "--json"}, &out, &errOut); code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut.String())
	}
	var got struct {
		Verdict *handcalc.Verdict `json:"verdict"`
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if got.Verdict == nil || len(got.Verdict.Lines) != 2 {
		t.Fatalf("verdict %+v", got.Verdict)
	}
	for _, l := range got.Verdict.Lines {
		if want := 480 / l.CapacityKN; abs(l.Utilisation-want) > 1e-9 {
			t.Errorf("%s: utilisation %g, want Z_Ed/Z_u = %g", l.Method, l.Utilisation, want)
		}
		if l.Status != handcalc.UtilisationStatus(l.Utilisation, handcalc.DefaultBorderline) {
			t.Errorf("%s: status %q for utilisation %g", l.Method, l.Status, l.Utilisation)
		}
	}
	out.Reset()
	// A flag with a value after the model file (the value must not be
	// taken for a second file).
	if code := run([]string{"hand", path, "--margin", "0.05"}, &out, &errOut); code != exitOK {
		t.Fatalf("--margin after the file: exit %d: %s", code, errOut.String())
	}
	out.Reset()
	if code := run([]string{"hand", path}, &out, &errOut); code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut.String())
	}
	for _, want := range []string{"Petersen", "Seidel", "VDI 2230", "Schmidt/Neuper", "Verdict for the design segment force", "design aid"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("hand output lacks %q", want)
		}
	}
	for _, args := range [][]string{{"hand"}, {"hand", path, "--margin", "1.5"}, {"hand", filepath.Join(t.TempDir(), "missing.toml")}} {
		if code := run(args, &out, &errOut); code != exitBadInput {
			t.Errorf("%v: exit %d, want %d", args, code, exitBadInput)
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
