package modelfile

import (
	"bytes"
	"fmt"
	"math"
	"strconv"

	"github.com/BurntSushi/toml"
)

// ResolvedTOML writes the model with every default filled in; Decode
// reads it back to an equal Spec.
func (s *Spec) ResolvedTOML() ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("# flangeseg model with every default filled in (lengths mm, forces N, stresses MPa, angles degrees)\n")
	enc := toml.NewEncoder(&b)
	enc.Indent = ""
	if err := enc.Encode(s); err != nil {
		return nil, fmt.Errorf("write the resolved model: %w", err)
	}
	return b.Bytes(), nil
}

// FormatNumber formats a number the shortest way that reads back exactly, without
// an exponent for the sizes a model has.
func FormatNumber(x float64) string {
	if a := math.Abs(x); x == 0 || (a >= 1e-6 && a < 1e15) {
		return strconv.FormatFloat(x, 'f', -1, 64)
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}
