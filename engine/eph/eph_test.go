package eph

import (
	"bytes"
	"errors"
	"flag"
	"image"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var (
	update = flag.Bool("update", false, "rewrite ../testdata/eph/*.golden")
	keep   = flag.String("keep", "", "also write the rendered PNGs to this directory")
)

func flat(label string, e float64) Curve {
	return Curve{Label: label, E: func(float64) float64 { return e }}
}

// render draws a picture and decodes it.
func render(t *testing.T, name string, ox, red Curve, mixPH float64) image.Image {
	t.Helper()
	var buf bytes.Buffer
	if err := Draw(&buf, ox, red, mixPH, "T-204 rinse: "+name); err != nil {
		t.Fatalf("Draw(%s): %v", name, err)
	}
	if *keep != "" {
		if err := os.WriteFile(filepath.Join(*keep, name+".png"), buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatalf("Draw(%s) wrote no valid PNG: %v", name, err)
	}
	if b := img.Bounds(); b.Dx() != WidthPx || b.Dy() != HeightPx {
		t.Fatalf("Draw(%s) image is %dx%d, want %dx%d", name, b.Dx(), b.Dy(), WidthPx, HeightPx)
	}
	return img
}

// shadePixels counts pixels of the shading colour in the columns [x0, x1).
func shadePixels(img image.Image, x0, x1 int) int {
	want := ShadeColour()
	n := 0
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X + x0; x < b.Min.X+x1; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if near(r, want.R) && near(g, want.G) && near(bl, want.B) {
				n++
			}
		}
	}
	return n
}

func near(c uint32, want uint8) bool {
	d := int(c>>8) - int(want)
	return d >= -3 && d <= 3
}

func TestDrawShading(t *testing.T) {
	everywhere := render(t, "everywhere", flat("Fe^3+/Fe^2+", 0.77), flat("Cu^2+/Cu", 0.34), 2)
	nowhere := render(t, "nowhere", flat("Zn^2+/Zn", -0.76), flat("Cu^2+/Cu", 0.34), 2)
	area := WidthPx * HeightPx
	if n := shadePixels(everywhere, 0, WidthPx); n < area/3 {
		t.Errorf("spontaneous everywhere: %d shaded pixels, want at least a third of %d", n, area)
	}
	if n := shadePixels(nowhere, 0, WidthPx); n != 0 {
		t.Errorf("spontaneous nowhere: %d shaded pixels, want 0", n)
	}

	// Acidic oxygen against Fe^3+/Fe^2+: E(O2) = 1.229 − 0.0592·pH crosses 0.771 V near pH 7.7,
	// so the left part of the plot is shaded and the right part is not.
	o2 := NernstLine("O2/H2O", 1.229, 0, 4, 4, 298.15)
	half := render(t, "half", o2, flat("Fe^3+/Fe^2+", 0.771), 3)
	left, right := shadePixels(half, 0, WidthPx/3), shadePixels(half, 2*WidthPx/3, WidthPx)
	if left < 20*right || left == 0 {
		t.Errorf("crossing at pH 7.7: %d shaded pixels in the left third, %d in the right third; want the left far more", left, right)
	}
	// The mix-pH marker and the curves must differ between two mix pH values.
	other := render(t, "half-ph11", o2, flat("Fe^3+/Fe^2+", 0.771), 11)
	if diffPixels(half, other) < 100 {
		t.Errorf("moving the mix pH from 3 to 11 changed fewer than 100 pixels")
	}
}

func diffPixels(a, b image.Image) int {
	n := 0
	for y := 0; y < HeightPx; y++ {
		for x := 0; x < WidthPx; x++ {
			r1, g1, b1, _ := a.At(x, y).RGBA()
			r2, g2, b2, _ := b.At(x, y).RGBA()
			if r1 != r2 || g1 != g2 || b1 != b2 {
				n++
			}
		}
	}
	return n
}

func TestDrawOddCurves(t *testing.T) {
	// A couple that applies only in acid (NaN above pH 9) and a mix pH below 0.
	partial := Curve{Label: "HOCl/Cl2", E: func(pH float64) float64 {
		if pH > 9 {
			return math.NaN()
		}
		return 1.63 - 0.0592*pH
	}}
	render(t, "partial", partial, flat("Cl-/Cl2", 1.36), -0.8)
	// Flat, identical curves: the y range must still be usable.
	render(t, "flat", flat("a", 0.5), flat("b", 0.5), 7)
}

func TestDrawErrors(t *testing.T) {
	good := flat("Cu^2+/Cu", 0.34)
	tests := []struct {
		name     string
		ox, red  Curve
		ph       float64
		want     string
		sentinel error
	}{
		{"nil function", Curve{Label: "broken"}, good, 7, "no potential function", ErrNoCurve},
		{"never finite", Curve{Label: "void", E: func(float64) float64 { return math.NaN() }}, good, 7, "no finite potential", ErrNoCurve},
		{"NaN pH", good, good, math.NaN(), "not a number", nil},
		{"absurd pH", good, good, 40, "outside", nil},
	}
	for _, tc := range tests {
		var buf bytes.Buffer
		err := Draw(&buf, tc.ox, tc.red, tc.ph, tc.name)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
		if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
			t.Errorf("%s: error %v is not %v", tc.name, err, tc.sentinel)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: %d bytes written despite the error", tc.name, buf.Len())
		}
	}
}

func TestNernstSlope(t *testing.T) {
	tests := []struct {
		tK, want, tol float64
		source        string
	}{
		// RT·ln10/F at 25 °C: 0.05916 V (CODATA constants; common textbook value, from memory).
		{298.15, 0.05916, 0.00001, "CODATA, from memory"},
		// At 0 °C: 0.05420 V (same constants; scales with T).
		{273.15, 0.05420, 0.00001, "CODATA, from memory"},
	}
	for _, tc := range tests {
		if got := NernstSlope(tc.tK); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("NernstSlope(%g) = %.6f, want %g (%s)", tc.tK, got, tc.want, tc.source)
		}
	}
	// Permanganate, 8 H+ per 5 e-: slope 8/5 · 0.05916 = 0.09466 V/pH.
	mn := NernstLine("MnO4-/Mn^2+", 1.507, 0, 8, 5, 298.15)
	if got := mn.E(0) - mn.E(1); math.Abs(got-0.09466) > 0.00002 {
		t.Errorf("permanganate slope = %.5f V/pH, want 0.09466", got)
	}
	// The line passes through its reference point.
	l := NernstLine("x", 0.8, 4.5, 2, 1, 310)
	if got := l.E(4.5); got != 0.8 {
		t.Errorf("E at the reference pH = %g, want 0.8", got)
	}
	if got := NernstLine("bad", 1, 0, 1, 0, 298.15).E(3); !math.IsNaN(got) {
		t.Errorf("zero electrons: E = %g, want NaN", got)
	}
}

func TestSpontaneous(t *testing.T) {
	o2 := NernstLine("O2/H2O", 1.229, 0, 4, 4, 298.15)
	fe := flat("Fe^3+/Fe^2+", 0.771)
	cross := (1.229 - 0.771) / NernstSlope(298.15) // about pH 7.74
	tests := []struct {
		name    string
		ox, red Curve
		want    []Range
	}{
		{"everywhere", fe, flat("Cu^2+/Cu", 0.34), []Range{{0, 14}}},
		{"nowhere", flat("Zn^2+/Zn", -0.76), fe, nil},
		{"below the crossing", o2, fe, []Range{{0, cross}}},
		{"above the crossing", fe, o2, []Range{{cross, 14}}},
		{"a window", Curve{Label: "bump", E: func(pH float64) float64 { return 1 - math.Abs(pH-7)/2 }}, flat("flat", 0), []Range{{5, 9}}},
	}
	for _, tc := range tests {
		got := Spontaneous(tc.ox, tc.red, 0, 14)
		if len(got) != len(tc.want) {
			t.Errorf("%s: Spontaneous = %v, want %v", tc.name, got, tc.want)
			continue
		}
		for i := range got {
			if math.Abs(got[i].From-tc.want[i].From) > 0.001 || math.Abs(got[i].To-tc.want[i].To) > 0.001 {
				t.Errorf("%s: Spontaneous = %v, want %v ±0.001", tc.name, got, tc.want)
			}
		}
	}
	if got := Spontaneous(Curve{}, fe, 0, 14); got != nil {
		t.Errorf("Spontaneous with a nil curve = %v", got)
	}
}

func TestSummaryGolden(t *testing.T) {
	o2 := NernstLine("O2/H2O", 1.229, 0, 4, 4, 298.15)
	fe := flat("Fe^3+/Fe^2+", 0.771)
	cases := []struct {
		name    string
		ox, red Curve
		ph      float64
	}{
		{"everywhere", fe, flat("Cu^2+/Cu", 0.34), 2},
		{"nowhere", flat("Zn^2+/Zn", -0.76), fe, 2},
		{"crossing", o2, fe, 3},
		{"below zero", o2, fe, -0.5},
	}
	var b strings.Builder
	for _, c := range cases {
		b.WriteString(c.name + ": " + Summary(c.ox, c.red, c.ph) + "\n")
	}
	path := filepath.Join("..", "testdata", "eph", "summary.golden")
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	if b.String() != string(want) {
		t.Errorf("Summary output differs from %s (run with -update if the change is intended)\ngot:\n%swant:\n%s", path, b.String(), want)
	}
}

func BenchmarkDraw(b *testing.B) {
	o2 := NernstLine("O2/H2O", 1.229, 0, 4, 4, 298.15)
	fe := flat("Fe^3+/Fe^2+", 0.771)
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := Draw(&buf, o2, fe, 3, "bench"); err != nil {
			b.Fatal(err)
		}
	}
}
