package hazard

import (
	"sort"
	"strings"
)

// Code describes one hazard code: what forms or happens, in a few words,
// and the older codes it replaces.
type Code struct {
	Code    string
	Title   string   // the decision's reason in a few words
	Aliases []string // older codes (class-pair names) that still find it in the log
}

// Codes lists every hazard code the judgement can raise, in the order of
// the README's list.
var codes = []Code{
	{"hcn-release", "releases hydrogen cyanide", []string{"acid-cyanide", "cyanide-low-ph", "toxic-gas"}},
	{"cyanogen-chloride-release", "releases cyanogen chloride", []string{"toxic-gas"}},
	{"cyanide-kept-alkaline", "cyanide present: keep it alkaline", []string{"cyanide-present"}},
	{"cyanide-complexed", "binds cyanide as iron complexes: still cyanide waste", []string{"cyanide-present"}},
	{"cyanide-complex-acid", "acid frees hydrogen cyanide from a cyanide complex", []string{"acid-cyanide"}},
	{"chlorine-release", "releases chlorine", []string{"hypochlorite-acid", "toxic-gas"}},
	{"chloramine-release", "forms chloramines", []string{"hypochlorite-ammonia"}},
	{"nitrogen-trichloride", "forms explosive nitrogen trichloride", []string{"hypochlorite-ammonia"}},
	{"clo2-release", "releases chlorine dioxide", []string{"toxic-gas"}},
	{"chloric-acid", "acid chlorate: chloric acid, gives chlorine dioxide when warm, fires organic matter", nil},
	{"bromine-release", "releases bromine", []string{"toxic-gas"}},
	{"h2s-release", "releases hydrogen sulfide", []string{"acid-sulfide", "sulfide-near-neutral", "toxic-gas"}},
	{"so2-release", "releases sulfur dioxide", []string{"acid-sulfite", "sulfite-acidic", "toxic-gas"}},
	{"no2-release", "releases nitrogen dioxide", []string{"toxic-gas"}},
	{"no-release", "releases nitric oxide", []string{"toxic-gas"}},
	{"nocl-release", "releases nitrosyl chloride", []string{"toxic-gas"}},
	{"nitrous-fumes", "gives off some nitrogen oxides: work with extraction", []string{"toxic-gas"}},
	{"ammonia-release", "releases ammonia", []string{"ammonium-base", "toxic-gas"}},
	{"ammonium-salt-fumes", "fumes of ammonium salt and heat", nil},
	{"co2-release", "releases carbon dioxide", []string{"acid-carbonate", "toxic-gas"}},
	{"fizzing-pressure", "fizzes: foam-over and pressure", []string{"acid-carbonate"}},
	{"gas-pressure", "gives off enough gas to burst a closed tank", nil},
	{"hydrogen-release", "releases flammable hydrogen", []string{"flammable-gas"}},
	{"alkali-metal-fire", "alkali metal with water: fire", []string{"flammable-gas"}},
	{"oxygen-release", "releases oxygen", []string{"oxygen-enrichment"}},
	{"oxygen-surge", "oxygen surge with heat", []string{"oxygen-enrichment"}},
	{"n-chloro-compounds", "forms N-chloro compounds (chloramines)", []string{"hypochlorite-ammonia"}},
	{"nitric-organic-runaway", "nitric acid with organic matter: runaway, nitrogen dioxide", nil},
	{"ammonium-nitrite-runaway", "ammonium with nitrite: runaway decomposition", nil},
	{"manganese-heptoxide", "forms explosive manganese heptoxide", nil},
	{"acid-fumes", "drives out acid fumes", []string{"toxic-gas"}},
	{"oleum-mist", "oleum with water: sulfuric acid mist", nil},
	{"halogen-fumes", "gives off bromine or iodine with sulfur dioxide", []string{"toxic-gas"}},
	{"hydrazine-nitric", "hydrazine with nitric acid: violent, explosive salt", nil},
	{"chlorate-sulfite", "chlorate with sulfite: self-accelerating, can take off", nil},
	{"hf-release", "releases hydrogen fluoride", nil},
	{"hcl-release", "releases hydrogen chloride", nil},
	{"hydrazine-oxidizer", "concentrated hydrazine with an oxidizer: violent, hydrazine vapour", nil},
	{"hydroxylamine-decomposition", "hydroxylamine with iron or copper salts: violent decomposition", nil},
	{"damp-dithionite", "wet dithionite heats itself: gives off SO2, can ignite", nil},
	{"hot-dithionite", "hot dithionite breaks down: bath turns acid, sulfur dioxide follows", nil},
	{"hypophosphite-phosphine", "hot hypophosphite: can give off phosphine", nil},
	{"hydroxylamine-freed", "frees hydroxylamine from its salt: unstable, keep cool, use at once", nil},
	{"stream-fumes", "a stream gives off a toxic gas by itself", []string{"toxic-gas"}},
	{"solid-oxidizer-heating", "solid chlorinating agent: heats and ignites with little water", nil},
	{"slow-hydrogen", "slow release of flammable hydrogen", []string{"flammable-gas"}},
	{"nitric-slow-attack", "metal attacked slowly by nitric acid: brown fumes", nil},
	{"cyanide-oxidation", "cyanide oxidation: only as a controlled step", []string{"cyanide-present"}},
	{"hot-electroless-bath", "hot electroless-nickel bath: can crash with hydrogen", []string{"flammable-gas"}},
	{"explosive-residue", "leaves explosive residues on standing", nil},
	{"hf-burns", "hydrofluoric acid: deep burns and fumes", nil},
	{"self-heating", "self-heating decomposition", nil},
	{"silica-gel", "gels, can block lines", nil},
	{"alkaline-peroxide", "concentrated peroxide made alkaline: oxygen and heat", []string{"oxygen-enrichment"}},
	// organic, azide and solid-chlorinator families
	{"co-release", "releases carbon monoxide", []string{"toxic-gas"}},
	{"hn3-release", "releases hydrazoic acid", []string{"acid-azide", "toxic-gas"}},
	{"azide-forming", "hydrazine with nitrite: forms hydrazoic acid once acid", nil},
	{"azide-left", "azide destruction incomplete: azide left", nil},
	{"organic-peroxides", "forms explosive organic peroxides", nil},
	{"perchlorate-esters", "forms explosive perchlorate esters", nil},
	{"nitrate-esters", "forms nitrate esters (explosive); never cool and hold", nil},
	{"peracid-alkali", "peracid with strong alkali: violent decomposition, oxygen and boiling caustic", []string{"oxygen-enrichment"}},
	{"oxidizer-organic-fire", "strong oxidizer with organic liquid: fire or violent reaction", nil},
	{"oxidizer-organic-heat", "strong oxidizer solution oxidizes the organic liquid: heat", []string{"oxidizer-organic-fire"}},
	{"flammable-liquid", "the mix is a flammable liquid: its vapour can be lit", nil},
	{"oxidizer-fuel-blend", "solid oxidizer blended dry with a fuel: fire or explosion", nil},
	{"peracid-runaway", "peracid forms fast from concentrated peroxide: violent decomposition", nil},
	{"dry-blend-gas-when-wet", "dry acid with carbonate: carbon dioxide once wet", nil},
	{"dry-blend-chlorine", "solid chlorinating agent blended dry with a solid acid: chlorine, heat, fire", nil},
	{"dry-blend-ammonia", "dry ammonium salt with caustic: ammonia and heat once damp", []string{"toxic-gas"}},
	{"bis-chloromethyl-ether", "forms bis(chloromethyl) ether (causes cancer)", nil},
	{"formaldehyde-caustic-heat", "formaldehyde with strong caustic: runaway heat", nil},
	{"formaldehyde-ammonia-heat", "formaldehyde with ammonia: strong heat, ammonia boils off", nil},
	{"formaldehyde-oxidation", "formaldehyde with hypochlorite: fast, hot oxidation", nil},
	{"chloroform-formation", "forms chloroform (haloform reaction)", nil},
	{"heavy-metal-azide", "forms explosive heavy-metal azides", nil},
	{"nitrogen-triiodide", "iodine with strong ammonia: explosive nitrogen triiodide", nil},
	{"silver-fulminate", "silver salt with nitric acid and ethanol: explosive fulminate", nil},
	{"cyanogen-release", "copper(II) with cyanide: gives off toxic cyanogen", []string{"toxic-gas", "cyanide-present"}},
	{"mixed-chlorinators", "different chlorinating products: fire, chlorine, nitrogen trichloride", nil},
	{"chromium-vi-exposure", "hexavalent chromium (causes cancer)", []string{"carcinogen-cr6"}},
	{"chromium-vi-not-reduced", "chromium(VI) not reduced at this pH", []string{"carcinogen-cr6"}},
	{"chlorate-reducer-acid", "chlorate with a reducing agent: never acidify", nil},
	{"peracid-forming", "forms peracetic acid slowly: gas on standing", nil},
	{"warm-bleach", "warm bleach: loses strength, forms chlorate", nil},
	{"warm-persulfate", "warm persulfate gives off oxygen as it stands", nil},
	{"hot-peroxide-concentrate", "concentrated peroxide heated past about 50 °C: can run away", nil},
	{"peroxide-slow-oxygen", "peroxide beside dissolved copper in acid: oxygen over hours", []string{"oxygen-enrichment"}},
	{"caro-acid-forming", "peroxide with strong sulfuric acid: Caro's acid fires organic matter", nil},
	{"boils", "boils", []string{"boiling", "neutralisation-heat"}},
	{"near-boiling", "gets near boiling: spits where the streams meet", []string{"boiling", "strong-heat", "neutralisation-heat"}},
	{"scalding-heat", "gets hot enough to scald", []string{"strong-heat", "neutralisation-heat"}},
	{"warms", "warms noticeably", []string{"temperature-rise", "neutralisation-heat"}},
}

// Codes returns the hazard codes with their titles and older aliases.
func Codes() []Code {
	out := make([]Code, len(codes))
	for i, c := range codes {
		out[i] = Code{Code: c.Code, Title: c.Title, Aliases: append([]string(nil), c.Aliases...)}
	}
	return out
}

func codeOf(code string) Code {
	for _, c := range codes {
		if c.Code == code {
			return c
		}
	}
	panic("hazard: unknown code " + code)
}

// Aliases maps each older code to the codes that replace it.
func Aliases() map[string][]string {
	m := map[string][]string{}
	for _, c := range codes {
		for _, a := range c.Aliases {
			m[a] = append(m[a], c.Code)
		}
	}
	return m
}

// Equivalent lists the codes that name the same hazard as code, itself
// first: a new code with its older aliases, or an older code with the codes
// that replace it. The log search uses it so that old records are found by
// new codes and new records by old ones. Matching ignores case.
func Equivalent(code string) []string {
	code = strings.ToLower(strings.TrimSpace(code))
	set := map[string]bool{code: true}
	for _, c := range codes {
		if c.Code == code {
			for _, a := range c.Aliases {
				set[a] = true
			}
		}
		for _, a := range c.Aliases {
			if a == code {
				set[c.Code] = true
			}
		}
	}
	out := []string{code}
	delete(set, code)
	rest := make([]string, 0, len(set))
	for k := range set {
		rest = append(rest, k)
	}
	sort.Strings(rest)
	return append(out, rest...)
}
