package report

import (
	"fmt"
	"math"
)

// scaleStops are the sRGB colours of our sequential field scale, from the
// lowest value to the highest: parchment, ochre, brick, aubergine. Their
// OKLab lightness falls from stop to stop, so the scale is monotonic in
// lightness and prints legibly in grey.
var scaleStops = [...][3]uint8{
	{0xF3, 0xEF, 0xE0},
	{0xE3, 0xB0, 0x4B},
	{0xB4, 0x4B, 0x32},
	{0x3E, 0x1F, 0x47},
}

// fieldLevels is the number of colour steps of a field picture: cells of
// one step share one SVG path, which keeps the file small; 64 steps are
// finer than the eye separates on this scale, so no bands show.
const fieldLevels = 64

// scaleColour returns the colour at t ∈ [0, 1] of the field scale as
// "#rrggbb", interpolated linearly in OKLab between the stops.
func scaleColour(t float64) string {
	t = math.Min(1, math.Max(0, t))
	n := len(scaleStops) - 1
	k := min(int(t*float64(n)), n-1)
	f := t*float64(n) - float64(k)
	a, b := oklab(scaleStops[k]), oklab(scaleStops[k+1])
	var mix [3]float64
	for i := range mix {
		mix[i] = a[i] + f*(b[i]-a[i])
	}
	c := srgb(mix)
	return fmt.Sprintf("#%02x%02x%02x", c[0], c[1], c[2])
}

// levelColour is the colour of step k of fieldLevels, taken at the
// middle of the step.
func levelColour(k int) string {
	return scaleColour((float64(k) + 0.5) / fieldLevels)
}

// oklab converts an sRGB colour to OKLab (L, a, b), after B. Ottosson
// (2020), "A perceptual color space for image processing".
func oklab(c [3]uint8) [3]float64 {
	r, g, b := linear(c[0]), linear(c[1]), linear(c[2])
	l := math.Cbrt(0.4122214708*r + 0.5363325363*g + 0.0514459929*b)
	m := math.Cbrt(0.2119034982*r + 0.6806995451*g + 0.1073969566*b)
	s := math.Cbrt(0.0883024619*r + 0.2817188376*g + 0.6299787005*b)
	return [3]float64{
		0.2104542553*l + 0.7936177850*m - 0.0040720468*s,
		1.9779984951*l - 2.4285922050*m + 0.4505937099*s,
		0.0259040371*l + 0.7827717662*m - 0.8086757660*s,
	}
}

// srgb converts OKLab back to 8-bit sRGB, clamped to the gamut.
func srgb(lab [3]float64) [3]uint8 {
	l := lab[0] + 0.3963377774*lab[1] + 0.2158037573*lab[2]
	m := lab[0] - 0.1055613458*lab[1] - 0.0638541728*lab[2]
	s := lab[0] - 0.0894841775*lab[1] - 1.2914855480*lab[2]
	l, m, s = l*l*l, m*m*m, s*s*s
	r := 4.0767416621*l - 3.3077115913*m + 0.2309699292*s
	g := -1.2684380046*l + 2.6097574011*m - 0.3413193965*s
	b := -0.0041960863*l - 0.7034186147*m + 1.7076147010*s
	return [3]uint8{gamma(r), gamma(g), gamma(b)}
}

func linear(c uint8) float64 {
	v := float64(c) / 255
	if v <= 0.04045 {
		return v / 12.92
	}
	return math.Pow((v+0.055)/1.055, 2.4)
}

func gamma(v float64) uint8 {
	v = math.Min(1, math.Max(0, v))
	if v <= 0.0031308 {
		v *= 12.92
	} else {
		v = 1.055*math.Pow(v, 1/2.4) - 0.055
	}
	return uint8(math.Round(v * 255))
}

// regionTints are the fills of the joint drawing's regions: light,
// distinct tints under dark outlines, repeated for more regions.
var regionTints = [...]string{
	"#d9e2ec", // steel blue-grey: shells and flanges
	"#e8dcc8", // sand
	"#cfe3d4", // sage
	"#ead1d6", // rose
	"#d6d3ea", // lavender
	"#f0e6b8", // straw
	"#c9dfe3", // pale teal
	"#e3d0bd", // clay
	"#dfe6c3", // pale olive
	"#d3d9e0", // cool grey
}
