// Package material holds the constitutive laws of flangeseg: the response of
// one material point to a strain. It owns linear isotropic elasticity
// (Elastic), small-strain J2 plasticity with isotropic multilinear hardening
// (J2), the hardening curves of user tables and of built-in steel grades and
// bolt property classes, and a ductile damage indicator, all behind the Law
// interface.
//
// A J2 law for a shell plate of S355, 30 mm thick:
//
//	st, _ := material.SteelStrength("S355", 30)      // f_y = 345, f_u = 470 MPa
//	h, _ := st.Hardening(210000, material.DefaultNecking())
//	el, _ := material.NewElastic(210000, 0.3)
//	law, _ := material.NewJ2(el, h, material.StructuralSteelDamage())
//	committed := make([]float64, law.StateSize()) // zero: virgin
//	trial := make([]float64, law.StateSize())
//	strain := material.Vec4{0, 0.01, 0, 0} // xx, zz, yy, γ_xz
//	var stress material.Vec4
//	var tangent material.Mat4
//	err := law.Respond(material.PlaneStress, strain, committed, trial, &stress, &tangent)
//	ep, d := law.EquivalentPlasticStrain(trial), law.Damage(trial)
//
// # Conventions
//
// Vectors of strain and stress use the component order of the x–z section:
// xx, zz, yy, xz, where yy is the out-of-plane (circumferential) component and
// the xz strain is the engineering shear strain γ_xz = 2ε_xz. Stresses in MPa.
// Strains are small-strain total strains with an additive elastic–plastic
// split. A large-deformation element may pass a logarithmic strain in a
// co-rotated frame; the stress returned is then the Kirchhoff stress in that
// frame (divide by the volume ratio J for the Cauchy stress).
//
// A Law never changes the committed state it is given; it writes its trial
// state into the slice the caller provides, so the caller decides when an
// increment is accepted. Inputs are never modified. Laws hold no mutable
// state and may be shared between goroutines.
//
// In plane stress the yy strain given is ignored, σ_yy = 0 and the tangent
// has no yy row or column. The J2 law then finds the out-of-plane strain
// ε_yy as part of the answer and stores it at StateOutOfPlaneStrain (read it
// with OutOfPlaneStrain): the thickness change a large-deformation plane
// stress element needs.
//
// # State of J2 (StateSize = 7 values per point)
//
//	index  symbol                         meaning
//	0      ε̄_p                            equivalent plastic strain, ∫ √(2/3 ε̇ᵖ:ε̇ᵖ) dt
//	1–4    ε^p_xx, ε^p_zz, ε^p_yy, γ^p_xz  plastic strain (engineering shear)
//	5      D                              ductile damage indicator
//	6      ε_yy                           total out-of-plane strain of the response
//
// Callers read them through the History interface (EquivalentPlasticStrain,
// Damage, OutOfPlaneStrain) or J2.PlasticStrain, not by index.
//
// # Symbols
//
//	E, ν        Young's modulus (MPa), Poisson's ratio
//	G, K        shear modulus E/(2(1+ν)), bulk modulus E/(3(1−2ν))
//	σ_y(ε̄_p)    true yield stress of the hardening table, MPa
//	H           hardening modulus dσ_y/dε̄_p, MPa
//	q           von Mises stress √(3J₂), MPa; q_tr its elastic trial value
//	Δγ          consistency parameter of the return map
//	η           stress triaxiality σ_m/q, σ_m = (σ_xx + σ_zz + σ_yy)/3
//	ε_f(η)      fracture strain α·exp(−β·η)
//	f_y, f_u    yield (R_eH, R_p0.2) and tensile (R_m) strength, MPa
//	ε_sh, ε_u   engineering strain at the end of the yield plateau and at f_u
//	w           weight of Ling's post-necking extension
//	t           nominal product thickness for the EN 10025 bands, mm
//
// # Sources
//
//   - Return maps and consistent tangents: J. C. Simo and R. L. Taylor,
//     Comput. Methods Appl. Mech. Eng. 48 (1985) 101–118 (consistent
//     tangent); J. C. Simo and R. L. Taylor, Int. J. Numer. Methods Eng. 22
//     (1986) 649–670 (plane-stress projected return); J. C. Simo and
//     T. J. R. Hughes, Computational Inelasticity, Springer 1998, ch. 2–3.
//   - Engineering → true curve: ε_t = ln(1+ε_e), σ_t = σ_e(1+ε_e) up to the
//     tensile strength (common practice; EN 1993-1-5 Annex C.6).
//   - Past necking: Y. Ling, "Uniaxial true stress-strain after necking",
//     AMP Journal of Technology 5 (1996) 37–48, weighted linear/power-law
//     extension, default weight w = 0.5 (engineering judgement).
//   - Steel strengths: EN 10025-2 (S235–S355), EN 10025-3/-4 (S420, S460;
//     from memory), thickness bands t ≤ 16, 40, 63, 80, 100, 150 mm; R_m the
//     lower bound of the range (for 100 < t ≤ 150 mm from memory).
//   - Steel curve shape: plateau end and uniform elongation after X. Yun and
//     L. Gardner, J. Constr. Steel Res. 133 (2017) 36–46 (from memory); the
//     cubic hardening branch between them is engineering judgement.
//   - Bolt classes 8.8, 10.9, 12.9: ISO 898-1 minimum R_m, R_p0.2, A (from
//     memory) or the nominal f_ub, f_yb of EN 1993-1-8 Table 3.1 (12.9: the
//     ISO 898-1 nominal values; the Eurocode table does not list it);
//     uniform elongation A/2 (engineering judgement).
//   - Damage indicator: J. R. Rice and D. M. Tracey, J. Mech. Phys. Solids 17
//     (1969) 201–217; J. W. Hancock and A. C. Mackenzie, J. Mech. Phys.
//     Solids 24 (1976) 147–169; G. R. Johnson and W. H. Cook, Eng. Fract.
//     Mech. 21 (1985) 31–48. Family defaults are engineering estimates
//     calibrated on a reduction of area at a Bridgman neck (P. W. Bridgman,
//     Studies in Large Plastic Flow and Fracture, 1952).
//
// The built-in curves are minimum-value estimates for design studies, not
// measured material data: results that a joint's safety rests on must be
// checked against the governing codes (EN 1993-1-8, EN 1993-1-9) and signed
// off under local codes and licensed engineering practice.
package material
