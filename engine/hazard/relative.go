package hazard

import "mixward/engine"

// Relative judges a mix against its streams alone: a hazard a stream
// already carries before anything is mixed (the ammonia over strong ammonia
// solution, the fumes of concentrated hydrofluoric acid) is the stream's
// own, handled by its data sheet, and mixing is not the cause. Such a
// hazard is kept as info, unless mixing makes it worse: a gas whose
// headspace concentration rises above the stream's own, or a hazard whose
// severity rises.
func Relative(mix []engine.Hazard, alone []Alone) []engine.Hazard {
	out := make([]engine.Hazard, 0, len(mix))
	for _, h := range mix {
		if b, ok := ownHazard(h, alone); ok {
			h.Severity = engine.Info
			h.Message = "Already in " + b + " before mixing, and mixing does not make it worse: " + h.Message
			h.Action = "Handle it as that stream's own hazard (its safety data sheet)."
		}
		out = append(out, h)
	}
	return out
}

// alwaysOwnToMix are codes never left to a stream alone: heat comes from
// the mixing itself, a solid chlorinating agent heats when water meets it,
// and hydrofluoric acid and hexavalent chromium are handled during the
// mixing whatever their source (common practice, no source).
var alwaysOwnToMix = map[string]bool{"boils": true, "near-boiling": true, "solid-oxidizer-heating": true, "scalding-heat": true, "warms": true, "hf-burns": true, "chromium-vi-exposure": true, "warm-bleach": true}

// Alone is one stream judged by itself.
type Alone struct {
	Name    string
	Hazards []engine.Hazard
}

// ownHazard finds a stream that alone has the hazard at least as badly.
func ownHazard(h engine.Hazard, alone []Alone) (string, bool) {
	if h.Severity == engine.Info || alwaysOwnToMix[h.Code] {
		return "", false
	}
	for _, a := range alone {
		for _, b := range a.Hazards {
			if b.Code != h.Code {
				continue
			}
			if h.Gas != nil && b.Gas != nil {
				// A gas that fills the headspace either way is compared by
				// the amount that can leave the liquid.
				worse := h.Gas.HeadspacePPM > b.Gas.HeadspacePPM*1.05 ||
					(h.Gas.HeadspacePPM >= 1e6*0.999 && h.Gas.Mol > b.Gas.Mol*1.05)
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
