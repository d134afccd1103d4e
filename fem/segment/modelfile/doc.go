// Package modelfile owns the model file of a flange-segment check: its
// schema (Spec, one struct per TOML table), strict decoding that names
// every unknown key, the defaults, validation that reports every broken
// rule at once (*Error), the quantities derived from a valid model
// (Derived) and the resolved model that a run keeps (ResolvedTOML).
//
// Lengths are in mm, forces in N, stresses in MPa, angles in degrees.
// Decode and Load return a complete Spec, every default filled in;
// Validate checks a Spec built in code by the same rules.
//
//	s, err := modelfile.Load("joint.toml") // *modelfile.Error lists every problem
//	d := s.Derive()                        // d.StressArea, d.SegmentWidth, d.Warnings …
package modelfile
