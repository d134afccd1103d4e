package segment

import (
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
)

// The model file's names that the moved files use unqualified (a bridge until they name the package).
type (
	Spec         = modelfile.Spec
	Derived      = modelfile.Derived
	ZoneSpec     = modelfile.ZoneSpec
	MaterialSpec = modelfile.MaterialSpec
)

const (
	elastoplastic = modelfile.Elastoplastic
	elasticOnly   = modelfile.ElasticOnly
	planeStrain   = modelfile.PlaneStrain
	boltNominal   = modelfile.BoltNominal
	recessBoth    = modelfile.RecessBoth
	steelE        = modelfile.SteelE
)

// fnum formats a number as messages about the model write it.
func fnum(x float64) string { return modelfile.FormatNumber(x) }

const (
	caution = post.Caution
	version = post.Version
)
