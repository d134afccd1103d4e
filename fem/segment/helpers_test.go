package segment

import (
	"math"
	"os"
	"path/filepath"
)

// demoModel is a demo model as the binary embeds it; the tests read the
// files from cmd/flangeseg/demo, so there is one copy.
type demoModel struct {
	Name string // "flat", "bands"
	Data []byte
}

// demoModels returns the demo models in the binary's order: the flat face,
// then the defined contact bands.
func demoModels() []demoModel {
	var out []demoModel
	for _, name := range []string{"flat", "bands"} {
		data, err := os.ReadFile(filepath.Join("..", "..", "cmd", "flangeseg", "demo", name+".toml"))
		if err != nil {
			panic(err) // a test needs them; the checkout lacks them
		}
		out = append(out, demoModel{Name: name, Data: data})
	}
	return out
}

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

func ptr[T any](x T) *T { return &x }
