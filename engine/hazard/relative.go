package hazard

import (
	"sort"
	"strings"

	"mixward/engine"
)

// Relative judges a mix against its streams alone: a hazard a stream
// already carries before anything is mixed (the ammonia over strong ammonia
// solution, the fumes of concentrated hydrofluoric acid) is the stream's
// own, handled by its data sheet, and mixing is not the cause. Such a
// hazard is kept as info, unless mixing makes it worse: a gas whose
// headspace concentration rises above the stream's own, or a hazard whose
// severity rises. Relative judges the points of a pour, where a stream's
// own gas is the same whichever way it runs; RelativeFinal the final mix.
func Relative(mix []engine.Hazard, alone []Alone) []engine.Hazard {
	return relative(mix, alone, false)
}

// RelativeFinal is Relative for the final mix, with one difference: a toxic
// gas that stays above its exposure limit over the mix is a warning with the
// stream's own precautions, not info, even when the stream alone had more:
// the operator at the tank breathes it whatever its source, so the decision
// never reads "no concern" beside a gas above its limit.
func RelativeFinal(mix []engine.Hazard, alone []Alone) []engine.Hazard {
	return relative(mix, alone, true)
}

func relative(mix []engine.Hazard, alone []Alone, final bool) []engine.Hazard {
	out := make([]engine.Hazard, 0, len(mix))
	for _, h := range mix {
		if b, ok := ownHazard(h, alone); ok {
			h.Message = "Already in " + b + " before mixing, and mixing does not make it worse: " + h.Message
			if final && h.Gas != nil && h.Gas.Ratio >= 1 && h.Gas.LimitPPM > 0 && rank(h.Severity) >= rank(engine.Warning) {
				h.Severity = engine.Warning
				h.Title = strings.TrimPrefix(h.Title, "releases ") + " over the mix above its limit, as over " + b + " alone"
				h.Action = "Work with extraction running and the precautions of " + b + " itself (its safety data sheet); keep the tank covered."
				if h.Gas.ColdPPM > 0 {
					// The figure above is the mix at the temperature its
					// own heat reaches; dosed slowly and kept cool it holds
					// no more than the stream alone.
					h.Message += " Kept at the streams' temperature the mix holds about " + fmtNum(h.Gas.ColdPPM, 3) + " ppm, no more than over " + b + " alone: the rise comes from the mix's own heat."
					h.Action += " Dose slowly and keep the mix cool: its own heat drives the gas out."
				}
				if h.Gas.Ratio >= RespiratorRatio {
					h.Action += " Near an open tank wear respiratory protection: the fumes stand at " + fmtNum(h.Gas.Ratio, 2) + "× " + h.Gas.LimitName + " over the liquid."
				}
			} else {
				h.Severity = engine.Info
				if h.Code != "flammable-liquid" {
					// A flammable product keeps its own handling: the
					// operator stores the mix, not the stream.
					h.Action = "Handle it as that stream's own hazard (its safety data sheet)."
				}
			}
		} else if b, c, ok := hotOwnGas(h, alone); final && ok {
			h = hotOwn(h, b, c)
		}
		out = append(out, h)
	}
	if final {
		out = append(out, streamFumes(out, alone)...)
	}
	// Danger first, as Judge orders them.
	sort.SliceStable(out, func(i, j int) bool { return rank(out[i].Severity) > rank(out[j].Severity) })
	return out
}

// streamFumes are the toxic gases a stream gives off by itself above its
// exposure limit (neat bromine, strong ammonia or hydrochloric acid) that
// the mix takes up: the operator still handles the stream before it is in
// the tank, so the answer says so as a warning rather than "no concern"
// (NIOSH Pocket Guide, the gas's IDLH; common practice, no source: closed
// transfer and extraction for fuming liquids).
func streamFumes(mix []engine.Hazard, alone []Alone) []engine.Hazard {
	in := map[string]bool{}
	for _, h := range mix {
		in[h.Code] = true
	}
	var out []engine.Hazard
	for _, a := range alone {
		for _, b := range a.Hazards {
			if b.Gas == nil || b.Severity != engine.Danger || in[b.Code] || b.Gas.Ratio < 1 {
				continue
			}
			in[b.Code] = true
			out = append(out, engine.Hazard{
				Code: "stream-fumes", Severity: engine.Warning, Title: "fumes of " + strings.TrimPrefix(b.Title, "releases ") + " off " + a.Name + " as poured: closed transfer",
				Message: a.Name + " gives off " + strings.TrimPrefix(b.Title, "releases ") + " by itself (" + fmtNum(b.Gas.HeadspacePPM, 3) + " ppm over it, " +
					fmtNum(b.Gas.Ratio, 3) + "× " + b.Gas.LimitName + " " + fmtNum(b.Gas.LimitPPM, 3) + " ppm) until it is in the mix, which takes the gas up.",
				Action: "Transfer " + a.Name + " closed, or below the liquid surface, with extraction running and the protective equipment of its safety data sheet.",
				Source: b.Gas.LimitSource + "; closed transfer of fuming liquids: common practice, no source",
			})
		}
	}
	return out
}

// alwaysOwnToMix are codes never left to a stream alone: heat comes from
// the mixing itself, a solid chlorinating agent heats when water meets it,
// hydrofluoric acid and hexavalent chromium are handled during the mixing
// whatever their source, bleach left warm keeps making chlorate, and a
// hot electroless-nickel bath crashes when (and damp dithionite heats only once wetted)
// something is added to it (caustic, particles) (common practice, no source).
var alwaysOwnToMix = map[string]bool{"boils": true, "near-boiling": true, "solid-oxidizer-heating": true, "scalding-heat": true, "warms": true, "hf-burns": true, "chromium-vi-exposure": true, "hot-electroless-bath": true, "warm-bleach": true, "damp-dithionite": true}

// Alone is one stream judged by itself.
type Alone struct {
	Name    string
	Hazards []engine.Hazard
	// Hot are the stream's hazards alone at the temperature stated for
	// the mix, when that is hotter than the stream as stored (HotC, °C),
	// in its own headspace and in the tank's; nil otherwise. A gas the
	// stream gives off by itself at that temperature (hot dilute ammonia
	// in boiler feedwater) is its own vapour, not a reaction of the mix.
	Hot  []engine.Hazard
	HotC float64
	// InTank are the stream's hazards alone in the gas space of the tank
	// the mix is made in (the headspace its points are judged with): a
	// gas is compared at the same headspace, so that a drum's own sulfur
	// dioxide, judged by amount under the tank's headspace at a point of
	// the pour, is not taken for a gas the pour makes. Nil when the
	// tank's headspace is the stream's own.
	InTank []engine.Hazard
}

// ownHazard finds a stream that alone has the hazard at least as badly.
func ownHazard(h engine.Hazard, alone []Alone) (string, bool) {
	if h.Severity == engine.Info || alwaysOwnToMix[h.Code] {
		return "", false
	}
	for _, a := range alone {
		for _, b := range append(a.Hazards[:len(a.Hazards):len(a.Hazards)], a.InTank...) {
			if b.Code != h.Code {
				continue
			}
			if h.Gas != nil && b.Gas != nil {
				// A gas that fills the headspace either way is compared by
				// the amount that can leave the liquid. A gas the mix's own
				// heat drives out is compared at the streams' temperature:
				// the heat is judged by its own hazard, whose action (dose
				// slowly, watch the temperature) keeps the mix near it.
				ppm := h.Gas.HeadspacePPM
				if h.Gas.ColdPPM > 0 {
					ppm = h.Gas.ColdPPM
				}
				worse := ppm > b.Gas.HeadspacePPM*1.05 ||
					(ppm >= 1e6*0.999 && h.Gas.Mol > b.Gas.Mol*1.05)
				if !worse {
					return a.Name, true
				}
				continue
			}
			if rank(b.Severity) >= rank(h.Severity) {
				return a.Name, true
			}
		}
	}
	return "", false
}

// hotOwnGas finds a stream that alone, at the temperature stated for the
// mix, gives off the gas of the danger h at least as strongly (headspace
// within 5 %): the mix gives off the stream's own vapour at that
// temperature and no reaction forms more of it. It returns the stream's
// name and the temperature.
func hotOwnGas(h engine.Hazard, alone []Alone) (string, float64, bool) {
	if h.Severity != engine.Danger || h.Gas == nil || alwaysOwnToMix[h.Code] || h.Gas.LimitName == "LFL" {
		return "", 0, false
	}
	ppm := h.Gas.HeadspacePPM
	if h.Gas.ColdPPM > 0 {
		ppm = h.Gas.ColdPPM
	}
	for _, a := range alone {
		for _, b := range a.Hot {
			if b.Code == h.Code && b.Gas != nil && ppm <= b.Gas.HeadspacePPM*1.05 {
				return a.Name, a.HotC, true
			}
		}
	}
	return "", 0, false
}

// hotOwn turns the danger h, a gas stream b gives off by itself at c °C,
// into a warning with the precautions for a hot stream's own vapour:
// closed dosing and a vent to a safe place (common practice, no source:
// hot dosing of ammonia or hydrazine into boiler feedwater is done closed,
// with the deaerator or tank vented outside).
func hotOwn(h engine.Hazard, b string, c float64) engine.Hazard {
	gas := strings.TrimPrefix(h.Title, "releases ")
	h.Severity = engine.Warning
	h.Title = gas + " off the hot mix, as off " + b + " alone at " + fmtNum(c, 3) + " °C"
	h.Action = "Dose closed (through a closed line or below the surface) and vent the tank to a safe place: at " + fmtNum(c, 3) + " °C " + b +
		" gives off " + gas + " by itself, whatever it is mixed with."
	h.Message = "At " + fmtNum(c, 3) + " °C " + b + " gives off " + gas + " by itself, as much as the mix does: its own vapour, not a reaction. " + h.Message
	return h
}
