package main

import (
	"embed"
	"path"
)

// demoFiles holds the demo models the binary carries; tests read them from
// here too, so there is one copy.
//
//go:embed demo/flat.toml demo/bands.toml
var demoFiles embed.FS

// demoModel is a model file the binary carries.
type demoModel struct {
	Name string // file name without extension: "flat", "bands"
	Data []byte // the TOML text
}

// demoModels returns the demo models in a fixed order: the flat contact
// face, then the same joint with defined contact bands.
func demoModels() []demoModel {
	var out []demoModel
	for _, name := range []string{"flat", "bands"} {
		data, err := demoFiles.ReadFile(path.Join("demo", name+".toml"))
		if err != nil {
			// The files are embedded at build time, so this cannot happen.
			continue
		}
		out = append(out, demoModel{Name: name, Data: data})
	}
	return out
}
