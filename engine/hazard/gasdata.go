package hazard

import (
	"bufio"
	"bytes"
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"mixward/engine"
)

// GasFile is the gas table at the root of the data FS.
const GasFile = "gases.txt"

// GasData is one row of the gas table: how a gas shares itself between the
// liquid and the headspace, and the limit it is judged against.
type GasData struct {
	Formula     string
	Dissolved   string   // neutral dissolved form ("" when the tables have none)
	Pool        []string // dissolved species that turn into the gas
	KH          float64  // mol/(L·bar) at 25 °C
	LimitName   string   // IDLH, ceiling, LFL, O2, or stand-in (no published limit: another gas's, named in the source)
	LimitPPM    float64
	LimitSource string
	HenrySource string
	Name        string
}

// Data is what the judgement reads besides the Outcome: the gas table.
type Data struct {
	Gases map[string]*GasData
	order []string
	// Families are the reaction enthalpies of the families, by hazard code
	// (data/familyheats.txt); see UseSpecies.
	Families map[string]*FamilyHeat
	// Vapour are the rows of data/vapour.txt by gas: partial pressures over
	// the gas's own solution by strength.
	Vapour map[string][]VapourRow
}

// Load reads the gas table from fsys (normally data.FS).
func Load(fsys fs.FS) (*Data, error) {
	b, err := fs.ReadFile(fsys, GasFile)
	if err != nil {
		return nil, fmt.Errorf("read gas table: %w", err)
	}
	d, err := parseGases(b)
	if err != nil {
		return nil, err
	}
	if d.Families, err = loadFamilyHeats(fsys); err != nil {
		return nil, err
	}
	if d.Vapour, err = loadVapour(fsys, d.Gases); err != nil {
		return nil, err
	}
	return d, nil
}

func parseGases(b []byte) (*Data, error) {
	d := &Data{Gases: map[string]*GasData{}}
	sc := bufio.NewScanner(bytes.NewReader(b))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		g, err := parseGasRow(line)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %w", GasFile, n, err)
		}
		if _, dup := d.Gases[g.Formula]; dup {
			return nil, fmt.Errorf("%s:%d: gas %s is listed twice; keep one row", GasFile, n, g.Formula)
		}
		d.Gases[g.Formula] = g
		d.order = append(d.order, g.Formula)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", GasFile, err)
	}
	if len(d.order) == 0 {
		return nil, fmt.Errorf("%s: no gases listed", GasFile)
	}
	return d, nil
}

func parseGasRow(line string) (*GasData, error) {
	f := strings.Split(line, " | ")
	if len(f) != 9 {
		return nil, fmt.Errorf("want 9 fields separated by \" | \" (gas | dissolved form | pool | kH | limit | limit ppm | limit source | Henry source | name), got %d", len(f))
	}
	for i := range f {
		f[i] = strings.TrimSpace(f[i])
	}
	g := &GasData{Formula: f[0], LimitName: f[4], LimitSource: f[6], HenrySource: f[7], Name: f[8]}
	if sp, err := engine.ParseSpecies(f[0]); err != nil || sp.Charge != 0 {
		return nil, fmt.Errorf("gas %q: write a neutral formula such as Cl2", f[0])
	}
	if f[1] != "-" {
		g.Dissolved = f[1]
	}
	if f[2] != "-" {
		for _, p := range strings.Split(f[2], ",") {
			p = strings.TrimSpace(p)
			if _, err := engine.ParseSpecies(p); err != nil {
				return nil, fmt.Errorf("gas %s: pool species %q: %w", g.Formula, p, err)
			}
			g.Pool = append(g.Pool, p)
		}
	}
	var err error
	if g.KH, err = strconv.ParseFloat(f[3], 64); err != nil || g.KH < 0 || !finite(g.KH) {
		return nil, fmt.Errorf("gas %s: kH %q is not a non-negative number", g.Formula, f[3])
	}
	if g.LimitPPM, err = strconv.ParseFloat(f[5], 64); err != nil || !(g.LimitPPM > 0) || !finite(g.LimitPPM) {
		return nil, fmt.Errorf("gas %s: limit %q is not a positive number of ppm", g.Formula, f[5])
	}
	switch g.LimitName {
	case "IDLH", "ceiling", "LFL", "O2", "stand-in":
	default:
		return nil, fmt.Errorf("gas %s: limit %q: use IDLH, ceiling, LFL, O2 or stand-in", g.Formula, g.LimitName)
	}
	if g.LimitSource == "" || g.HenrySource == "" {
		return nil, fmt.Errorf("gas %s: name the sources of the limit and of the Henry's constant", g.Formula)
	}
	return g, nil
}

// LitreBarPerMolK is the molar gas constant in L·bar/(mol·K) (CODATA 2018,
// R = 8.314462618 J/(mol·K), through engine.MolarGasConstant).
func litreBarPerMolK() float64 { return engine.MolarGasConstant() / 100 }

// Headspace is the equilibrium share of a gas between a closed liquid and
// the gas space above it.
type Headspace struct {
	PartialBar float64 // partial pressure of the gas in the headspace
	PPM        float64 // volume fraction in the headspace, ppm (1e6 at most)
	GasMol     float64 // amount in the headspace at equilibrium
	Vents      bool    // the partial pressure reached the ambient pressure: the gas fills the headspace and the rest vents
}

// Share works out the headspace of a closed vessel at equilibrium. total is
// the amount (mol) of the gas and of the dissolved forms that turn into it;
// molecular is the share of that amount in the liquid present as the
// neutral dissolved form (1 for a gas with no acid–base forms). The mass
// balance is
//
//	total = p·kH·VL/molecular + p·VG/(R·T)
//
// (Henry's law for the neutral form, the ideal gas for the headspace),
// solved for p and capped at the ambient pressure.
func Share(total, molecular, kH, liquidL, headspaceL, tempK, pressureKPa float64) Headspace {
	if !(total > 0) || !(headspaceL > 0) || !(tempK > 0) || !(pressureKPa > 0) {
		return Headspace{}
	}
	if !(molecular > 0) {
		return Headspace{}
	}
	molecular = math.Min(molecular, 1)
	rt := litreBarPerMolK() * tempK
	p := total / (kH*liquidL/molecular + headspaceL/rt)
	amb := pressureKPa / 100
	h := Headspace{PartialBar: p}
	if p >= amb {
		h.PartialBar, h.Vents = amb, true
	}
	h.PPM = h.PartialBar / amb * 1e6
	h.GasMol = h.PartialBar * headspaceL / rt
	return h
}
