package main

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

func ptr[T any](x T) *T { return &x }

func demoSpec(t *testing.T, name string) *modelfile.Spec {
	t.Helper()
	for _, m := range demoModels() {
		if m.Name == name {
			s, err := modelfile.Decode(m.Data)
			if err != nil {
				t.Fatalf("demo %s: %v", name, err)
			}
			return s
		}
	}
	t.Fatalf("no demo model %q", name)
	return nil
}
func TestDemoModelsListed(t *testing.T) {
	var names []string
	for _, m := range demoModels() {
		names = append(names, m.Name)
		if !bytes.Contains(m.Data, []byte("[tower]")) {
			t.Errorf("demo %s: no [tower] table", m.Name)
		}
	}
	if strings.Join(names, ",") != "flat,bands" {
		t.Errorf("demo models %v, want flat, bands", names)
	}
}
