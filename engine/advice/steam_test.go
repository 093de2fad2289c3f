package advice_test

import (
	"strings"
	"testing"
)

// TestSteamOfBoilingMix: a mix whose heat passes the boiling point boils
// water off as steam, the heat past 100 °C over water's enthalpy of
// vaporisation (2257 kJ/kg at 100 °C, CRC Handbook, from memory); with a
// stated closed headspace the steam alone would burst it. Tried as a new
// user would: 50 % caustic with 32 % hydrochloric acid in a stated 500 L
// headspace said "boils" and nothing of the steam. Hand: about 108.7 MJ,
// of which about 72 MJ takes 230 kg from 25 to 100 °C (4.18 kJ/(kg·K));
// the rest, about 37 MJ, boils off about 16 kg; the tool's lower heat
// capacity for the concentrated solutes gives somewhat more.
func TestSteamOfBoilingMix(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L NaOH 50 % + 100 L HCl 32 % at headspace 500 L")
	h, ok := hazardOf(r, "boils")
	if !ok || h.Heat == nil {
		t.Fatalf("codes %v, want boils", hazardCodes(r))
	}
	if h.Heat.SteamKg < 12 || h.Heat.SteamKg > 30 {
		t.Errorf("steam %.1f kg, want about 16–25", h.Heat.SteamKg)
	}
	// 22 kg = 1220 mol at 373 K in 0.5 m³: about 76 bar.
	if h.Heat.SteamRiseBar < 30 || !strings.Contains(h.Action, "Never mix this in a closed vessel") {
		t.Errorf("steam in the stated headspace: %.0f bar, action %q", h.Heat.SteamRiseBar, h.Action)
	}
	r = ask(t, a, "mix 100 L NaOH 50 % + 100 L HCl 32 %")
	if h, ok := hazardOf(r, "boils"); !ok || h.Heat.SteamRiseBar != 0 || strings.Contains(h.Action, "closed vessel") {
		t.Errorf("no stated headspace: %+v", h)
	}
}
