// Package fatigue assesses bolt fatigue from a load history: rainflow
// counting, S–N curves, Palmgren–Miner damage and the damage-equivalent
// stress range, and the transfer of segment-force cycles through a sampled
// bolt-force function to bolt stress ranges. It imports nothing of
// flangeseg's; it works on numbers in mm, N, N·mm and MPa.
//
// A time series is counted as it streams: a Counter takes one sample at a
// time and keeps only the turning points not yet closed into cycles, so
// a file of 10⁷ samples never sits in memory. Each cycle keeps its two
// extremes, so a nonlinear bolt-force function maps its own minimum and
// maximum and the mean load is not lost:
//
//	f, _ := fatigue.NewBoltForceFunction(z, fs, ms)      // sampled Z → F_s, M_s
//	tr, _ := fatigue.NewTransfer(f, as, fatigue.AxialBending)
//	curve, _ := fatigue.Bolt(48)                         // EN 1993-1-9, detail category 50, k_s
//	miner, _ := fatigue.NewMiner(curve, 1.15)            // γ_Mf
//	var d float64
//	c := fatigue.NewCounter(func(cy fatigue.Cycle) error {
//		ds, err := tr.Range(cy)
//		d += miner.Damage(ds, cy.Count)
//		return err
//	})
//	for _, z := range samples { c.Add(z) }
//	c.Finish() // the residue counts as half cycles
//
// Symbols and their Go names:
//
//	Z          segment force (tension positive), N
//	F_s, M_s   bolt axial force (N) and bending moment (N·mm)
//	A_s        stress area of the bolt, mm²
//	d_s        diameter of the stress area, √(4·A_s/π), mm
//	W          section modulus on d_s, π·d_s³/32, mm³
//	Δσ         stress range, MPa
//	Δσ_C       detail category: Δσ at N_C = 2·10⁶ cycles
//	Δσ_D       constant-amplitude fatigue limit at 5·10⁶ cycles
//	Δσ_L       cut-off limit at 10⁸ cycles
//	k_s        size factor of bolts, (30/d)^0.25 for d > 30 mm
//	m          slope of an S–N branch: N·Δσ^m = const
//	N_R        endurance: cycles to failure at Δσ
//	γ_Mf       partial factor for fatigue strength
//	D          Palmgren–Miner damage Σ n_i/N_R,i
//	Δσ_eq      damage-equivalent stress range at N_ref cycles with slope m
//	M, N       tower-section bending moment (N·mm) and normal force (N)
//	D_t, n     shell mid-surface diameter (mm), number of bolts
//
// Sources: rainflow counting as ASTM E1049-85 (reapproved 2017), Standard
// Practices for Cycle Counting in Fatigue Analysis, section 5.4.4; S–N
// curves of direct stress ranges and the bolt detail as EN 1993-1-9:2005,
// Figure 7.1 and Table 8.1 (detail 14, bolts in tension, with the size
// factor); damage summation after Palmgren (1924) and Miner (1945) as
// EN 1993-1-9 Annex A uses it; the segment force of a tower section,
// Z = 4M/(n·D_t) − N/n, is common practice for ring flanges.
//
// Inputs are never modified. Functions return errors that name the value
// and the rule; nothing panics.
package fatigue
