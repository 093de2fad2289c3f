package equilibrium

import "math"

// Temperature range of the fits behind DaviesA.
const (
	daviesTMin = 273.15
	daviesTMax = 373.15
	// daviesIMax is the ionic strength (mol/kg) beyond which the Davies
	// equation is evaluated at this value (see the package comment).
	daviesIMax = 1.0
	// daviesINote is the ionic strength beyond which activities are flagged
	// as approximate.
	daviesINote = 0.5
)

// DaviesA returns the Debye–Hückel constant A (kg^½ mol^−½, log10 basis) at
// tempK, from A = 1.8248e6 · ρ^½ · (εT)^−3/2 (Robinson & Stokes, Electrolyte
// Solutions, 2nd ed. 1959; from memory) with the relative permittivity of
// water ε(t) = 87.740 − 0.40008 t + 9.398e-4 t² − 1.410e-6 t³, t in °C
// (Malmberg & Maryott 1956, J. Res. NBS 56, 1; from memory) and the density ρ
// held at 0.997 g/cm³ (assumption; it moves A by under 0.7 % between 0 and
// 60 °C). At 25 °C this gives 0.5108 against the tabulated 0.5091. Outside
// 0–100 °C the temperature is clamped to that range.
func DaviesA(tempK float64) float64 {
	t := math.Min(math.Max(tempK, daviesTMin), daviesTMax)
	c := t - 273.15
	eps := 87.740 - 0.40008*c + 9.398e-4*c*c - 1.410e-6*c*c*c
	return 1.8248e6 * math.Sqrt(0.997) * math.Pow(eps*t, -1.5)
}

// daviesLn returns ln γ per unit z² at ionic strength ionic.
func daviesLn(a, ionic float64) float64 {
	i := math.Min(math.Max(ionic, 0), daviesIMax)
	s := math.Sqrt(i)
	return -math.Ln10 * a * (s/(1+s) - 0.3*i)
}
