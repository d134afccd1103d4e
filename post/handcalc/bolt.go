package handcalc

// TensionResistance returns F_t,Rd = k₂·f_ub·A_s/γ_M2, N, with A_s in mm²
// and f_ub in MPa. k₂ = 0.9 (0.63 for countersunk bolts) and γ_M2 = 1.25 are
// the code's values (see DefaultParams); γ_M2 = 1 gives the characteristic
// resistance, k₂ = 1 the plain A_s·f_ub.
//
// Source: EN 1993-1-8, Table 3.4 (and 2.2 for γ_M2).
func TensionResistance(as, fub, k2, gammaM2 float64) float64 {
	return k2 * fub * as / gammaM2
}
