package main

import "flangeseg/fem/segment/modelfile"

// The model file's names that the command's files use unqualified.
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
