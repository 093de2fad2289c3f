package engine

// Result is the answer to one mix request. Its JSON form is the public
// contract of `mixward ask --format json`; field names never change, new
// fields may be added.
type Result struct {
	Request       string        `json:"request"`
	Species       []SpeciesInfo `json:"species"`
	Oxidizer      *Couple       `json:"oxidizer"`
	Reducer       *Couple       `json:"reducer"`
	Reaction      *Reaction     `json:"reaction"`
	ECellStandard *float64      `json:"e_cell_standard_v"`
	ECell         *float64      `json:"e_cell_v"`
	Alternatives  []Alternative `json:"alternatives"`
	Spontaneous   bool          `json:"spontaneous"`
	Verdict       Verdict       `json:"verdict"`
	DeltaGkJ      *float64      `json:"delta_g_kj"`
	Log10K        *float64      `json:"log10_k"`
	Hazards       []Hazard      `json:"hazards"`
	Cautions      []string      `json:"cautions"`

	// What comes out of the tank.
	Amounts          *Amounts     `json:"amounts"`
	Gases            []GasRelease `json:"gases"`
	Heat             *Heat        `json:"heat"`
	Steps            []Step       `json:"steps"`
	FinalComposition []AmountOf   `json:"final_composition"`
	Caveats          []string     `json:"caveats"`

	// Conditions the prediction was made under.
	Conditions Conditions `json:"conditions"`
	Allowance  *Allowance `json:"allowance"`            // kinetic allowance that moved the headline pair, if any
	Hindered   bool       `json:"kinetically_hindered"` // the headline is spontaneous but kinetically hindered
	// OutsideAqueous, when set, says what happens instead of the headline
	// equation: the mix has no water phase (a solid oxidizer in a neat
	// organic liquid), so the aqueous equation is the model's, not the
	// tank's.
	OutsideAqueous string `json:"outside_aqueous,omitempty"`

	Streams []StreamOut `json:"streams"` // the streams as understood, tags resolved
	Notes   []string    `json:"notes"`   // assumptions made (equal volumes, excess metal, ...)
	// ReadAs lists how the request itself was read (gallons, an amount
	// before a tag): the first of Notes, repeated for the short answer.
	ReadAs []string `json:"read_as"`

	// The operator's decision and the pour along the addition. The engine
	// leaves them nil; the judgement package (engine/hazard with
	// engine/pour, wired by engine/advice) fills them from the hazards.
	Decision *Decision `json:"decision,omitempty"`
	Addition *Addition `json:"addition,omitempty"`

	// HeldBack lists the changes that are downhill on paper but held back
	// at plant conditions (data/locks.txt), each with its reason.
	HeldBack []HeldBack `json:"held_back"`

	// NotAssessed lists the chemicals of the request the answer leaves out
	// for want of thermodynamic data (data/withheld.txt, rows with a role):
	// the answer is for the rest of the mix. Absent when every chemical is
	// assessed.
	NotAssessed []NotAssessed `json:"not_assessed,omitempty"`
}

// HeldBack is a kinetic lock that held something back in this mix.
type HeldBack struct {
	Lock     string    `json:"lock"`
	Reason   string    `json:"reason"`
	Source   string    `json:"source"`
	Reaction *Reaction `json:"reaction,omitempty"` // what would happen without the lock, when found
}

// Level is the answer to "may I combine these?".
type Level string

// The decision levels, most severe first.
const (
	DoNotMix        Level = "do-not-mix"
	WithPrecautions Level = "with-precautions"
	NoConcern       Level = "no-concern"
)

// Decision is what the operator reads first: whether to combine the
// streams, the main reason in a few words, the reasons in numbers and what
// to do. It is derived from the hazards (end state and along the pour),
// never from the redox verdict alone.
type Decision struct {
	Level   Level    `json:"level"`
	Title   string   `json:"title"`
	Reasons []string `json:"reasons"`
	Actions []string `json:"actions"`

	Heat       *HeatJudged `json:"heat,omitempty"` // the heat counted (reactions that proceed, neutralisation, dissolving)
	HeadspaceL float64     `json:"headspace_l"`    // gas space the concentrations are for
	// HeadspaceStated: HeadspaceL was stated in the request; else it is
	// taken equal to the liquid volume.
	HeadspaceStated bool         `json:"headspace_stated"`
	Held            []string     `json:"held_back"` // reactions possible on paper that are not counted, with the reason
	Gases           []GasRelease `json:"gases"`     // gases counted: from reactions that proceed and what the liquid cannot hold
}

// Addition is the pour judged along the way: each stream run into the
// other, from the first drop to the final ratio.
type Addition struct {
	Orders []PourOrder `json:"orders"`
	// Written is the order the request wrote ("pour A into B"), when it
	// wrote one.
	Written *WrittenOrder `json:"written,omitempty"`
	Advice  string        `json:"advice"`
	Points  int           `json:"points"` // mixes evaluated along the pour, all orders
	// Sequences are, for three or four streams, every order of running the
	// streams one after another into one tank, best first: the first stream
	// is the tank, each step runs the next stream into what is there.
	Sequences []PourSequence `json:"sequences,omitempty"`
}

// WrittenOrder is the order of addition a request wrote: Added runs into
// Into. Worse: it meets a hazard of a higher level than the other order,
// which the decision then names first.
type WrittenOrder struct {
	Added string `json:"added"`
	Into  string `json:"into"`
	Worse bool   `json:"worse"`
}

// PourSequence is one order of running three or more streams into one tank.
type PourSequence struct {
	Streams []string    `json:"streams"` // in the order they go in; the first is the tank
	Steps   []PourOrder `json:"steps"`   // each stream after the first run into what is there
	Worst   Severity    `json:"worst,omitempty"`
	// WaterFirst: the sequence starts the tank with a stream of water
	// alone (the natural way of a make-up: the rest dissolved or diluted
	// into it). Not part of the JSON answer: the decision reads it.
	WaterFirst bool `json:"-"`
	// BulkFirst: no stream is water, and the sequence starts the tank
	// with the largest stream by volume (the bulk liquid the others are
	// dosed into: a soda ash wash that hypochlorite and thiosulfate go
	// into). The natural way of such a make-up, as water first is of the
	// others. Not part of the JSON answer: the decision reads it.
	BulkFirst bool `json:"-"`
}

// PourOrder is one order of addition: Added is run into Into.
type PourOrder struct {
	Added   string       `json:"added"`
	Into    string       `json:"into"`
	Hazards []PourHazard `json:"hazards"`
	// AddedL and IntoL are the volumes of the two streams (0 when given by
	// mass), so the advice can tell when an order runs a tank into a drum.
	AddedL float64 `json:"added_l,omitempty"`
	IntoL  float64 `json:"into_l,omitempty"`
	// Advised marks the order of its pair that the advice names (at most
	// one of the two; none when either order will do or neither is safe):
	// the decision's title and the written-order check name the same one.
	Advised bool `json:"advised,omitempty"`
	// Dosed: the advised order is the smaller stream dosed under control
	// into the much larger one, although running the larger into the
	// smaller meets less (which is not practical at those volumes).
	Dosed bool `json:"dosed,omitempty"`
	// DryStep: every stream already in the tank is a solid given by mass
	// and the stream run in is another solid (a dry blend) or water run
	// onto them. Set on the steps of a sequence; not part of the JSON
	// answer.
	DryStep bool `json:"-"`
}

// PourHazard is one hazard met along a pour, between two fractions of the
// added stream (0 = first drop, 1 = all of it), with its worst severity.
type PourHazard struct {
	Code         string   `json:"code"`
	FromFraction float64  `json:"from_fraction"`
	ToFraction   float64  `json:"to_fraction"`
	Worst        Severity `json:"worst"`
	Message      string   `json:"message,omitempty"` // the worst point's message
	// GasFormula and GasMol, for a gas hazard, are the largest amount of
	// the gas given off at any point of the run, with the fraction of the
	// addition there (GasAtFraction): the tank holds all of the stream
	// added into and that share of the other, real amounts.
	// Diluted: met only where the added stream lands in a tank whose
	// reagents are already diluted in its water (see pour.DilutedTank),
	// and judged a warning there: dosed at a separate point with mixing
	// it meets no concentrate. Not part of the JSON answer.
	Diluted       bool    `json:"-"`
	GasFormula    string  `json:"gas_formula,omitempty"`
	GasMol        float64 `json:"gas_mol,omitempty"`
	GasAtFraction float64 `json:"gas_at_fraction,omitempty"`
}

// Verdict is the one-word outcome of a prediction.
type Verdict string

// The verdicts. Error is used only by the query log for requests that did
// not parse.
const (
	Spontaneous    Verdict = "spontaneous"
	NonSpontaneous Verdict = "non-spontaneous"
	NoReaction     Verdict = "no-reaction"
	ErrorVerdict   Verdict = "error"
)

// Role is what a species can do in the mix.
type Role string

// Roles of a species.
const (
	OxidizerRole Role = "oxidizer"
	ReducerRole  Role = "reducer"
)

// SpeciesInfo is one species present in the mix.
type SpeciesInfo struct {
	Text      string   `json:"text"`
	Formula   string   `json:"formula"`
	Charge    int      `json:"charge"`
	Phase     Phase    `json:"phase"`
	Roles     []Role   `json:"roles"`
	Spectator bool     `json:"spectator"`
	Mol       float64  `json:"mol"`                // amount present in the mix (0 for water, see Excess)
	Molar     float64  `json:"mol_per_l"`          // concentration after mixing, aqueous species only
	Excess    bool     `json:"excess"`             // a solid or water present in excess
	Partners  []string `json:"partners,omitempty"` // species it acts together with (partner couples)
}

// Couple is a half-reaction chosen for the oxidizing or the reducing side.
type Couple struct {
	Species      string  `json:"species"`
	HalfReaction string  `json:"half_reaction"` // as written for its role: reduction for the oxidizer, reversed for the reducer
	EStandard    float64 `json:"e_standard_v"`  // standard reduction potential of the couple
	E            float64 `json:"e_v"`           // reduction potential under the mix's conditions (Nernst)
	ID           string  `json:"id"`
	Medium       Medium  `json:"medium"`
	Electrons    int     `json:"electrons"`
	Source       string  `json:"source"`
}

// Reaction is a balanced net ionic equation. Electrons never appear in it.
type Reaction struct {
	Reactants []EqTerm `json:"reactants"`
	Products  []EqTerm `json:"products"`
	Text      string   `json:"text"`
	Electrons int      `json:"electrons"` // electrons transferred per reaction as written (n in ΔG = −nFE)
}

// EqTerm is one term of a net ionic equation.
type EqTerm struct {
	Formula string `json:"formula"`
	Charge  int    `json:"charge"`
	Phase   Phase  `json:"phase"`
	Coef    int    `json:"coef"`
	Text    string `json:"text"`
}

// Alternative is another oxidizer–reducer pair present whose cell potential
// is positive under the mix's conditions.
type Alternative struct {
	Oxidizer      *Couple   `json:"oxidizer"`
	Reducer       *Couple   `json:"reducer"`
	Reaction      *Reaction `json:"reaction"`
	ECellStandard float64   `json:"e_cell_standard_v"`
	ECell         float64   `json:"e_cell_v"`
	Note          string    `json:"note,omitempty"` // e.g. why it is not the headline
	// Hindered: spontaneous, but not once its kinetic allowance is counted.
	Hindered bool `json:"kinetically_hindered"`
}

// Severity of a hazard.
type Severity string

// Hazard severities, least to most severe.
const (
	Info    Severity = "info"
	Warning Severity = "warning"
	Danger  Severity = "danger"
)

// Hazard is one hazard found in the mix.
type Hazard struct {
	Code     string   `json:"code"`
	Severity Severity `json:"severity"`
	Message  string   `json:"message"`
	Source   string   `json:"source,omitempty"`

	// Filled by the judgement (engine/hazard); empty from the table rules.
	Aliases []string    `json:"aliases,omitempty"` // older codes of the same hazard, still searchable
	Title   string      `json:"title,omitempty"`   // a few words: "releases hydrogen cyanide"
	Action  string      `json:"action,omitempty"`  // what to do
	Gas     *GasJudged  `json:"gas,omitempty"`     // the gas, in numbers, when the hazard is a gas
	Heat    *HeatJudged `json:"heat,omitempty"`    // the heat, when the hazard is heat
	// ReactionHeat is the heat of the reaction a family hazard names
	// (Cannizzaro, the haloform reaction, an oxidizer with an organic
	// liquid), which the equilibrium state does not run; the decision's
	// heat adds it.
	ReactionHeat *ReactionHeat `json:"reaction_heat,omitempty"`
	// RunawayHeat is the heat of the runaway a family hazard names but
	// the mix as made does not run (it is held back until warm or acid):
	// never counted, shown as the heat if it runs.
	RunawayHeat *ReactionHeat `json:"runaway_heat,omitempty"`
	// Counts are the gases a hazard counts by amount outside its Gas
	// figure: a reaction family the equilibrium state does not run
	// (hydrogen chloride driven out by concentrated sulfuric acid, oxygen
	// from peroxide made alkaline), or a volatile product held in the
	// liquid (chloramines). The short answer lists each under "Forms".
	Counts []GasCount `json:"gas_counts,omitempty"`
}

// GasCount is a gas a hazard counts by amount: the most that can come off
// by the reaction's stoichiometry, or (InLiquid) the amount of a volatile
// product in the liquid whose vapour the answer does not count. The
// headspace figure is the equilibrium state's, when the state holds the
// gas; the limit is the gas table's or the family's own, when one is
// listed.
type GasCount struct {
	Formula string  `json:"formula"`
	Name    string  `json:"name"`
	Mol     float64 `json:"mol"`                // up to this much comes off (InLiquid: is in the liquid)
	VolumeL float64 `json:"volume_l,omitempty"` // Mol as gas at the mix's temperature and pressure
	// InLiquid: Mol is in the liquid, and its vapour is not counted.
	InLiquid bool `json:"in_liquid,omitempty"`
	// Beyond: the gas comes from a reaction the equilibrium state does not
	// run, so it adds to what the state gives off (a gas hazard's Mol);
	// false when it is the state's own gas told again.
	Beyond bool   `json:"beyond_state,omitempty"`
	From   string `json:"from"` // what gives it, in a few words
	// HeadspacePPM is the mixed state's equilibrium headspace figure for
	// the gas (0 when the state holds none).
	HeadspacePPM float64 `json:"headspace_ppm,omitempty"`
	LimitName    string  `json:"limit_name,omitempty"` // IDLH, ceiling, LFL, O2; empty when no exposure limit is listed
	LimitPPM     float64 `json:"limit_ppm,omitempty"`
	Ratio        float64 `json:"ratio,omitempty"` // HeadspacePPM / LimitPPM
	LimitSource  string  `json:"limit_source,omitempty"`
	// ClosedRiseBar, on the gases of the gas-pressure hazard, is the
	// pressure rise (bar above the ambient) all the gas the mix gives off
	// would give its closed headspace: ideal gas at the mix's temperature,
	// all of it as gas.
	ClosedRiseBar float64 `json:"closed_rise_bar,omitempty"`
}

// ReactionHeat is the heat of a reaction judged as a family: its
// stoichiometry and reaction enthalpy, run as far as the reagent that runs
// out first allows. Two families that use up the same reagent are not both
// counted: the one giving off more heat is (Counted), the other listed.
type ReactionHeat struct {
	Code           string   `json:"code"`               // the family's hazard code
	Reaction       string   `json:"reaction"`           // as written for DeltaHkJPerMol
	DeltaHkJPerMol float64  `json:"delta_h_kj_per_mol"` // per mol of reaction as written
	ExtentMol      float64  `json:"extent_mol"`         // mol of reaction as written
	Limiting       string   `json:"limiting"`           // the reagent that runs out first
	ReleasedkJ     float64  `json:"released_kj"`        // -DeltaHkJPerMol × ExtentMol
	Reagents       []string `json:"reagents"`           // what it uses up, for sharing between families
	Counted        bool     `json:"counted"`            // added to the decision's heat
	Source         string   `json:"source"`
	// ReachedC and Boils are given for a runaway that is held back (see
	// HeatJudged.IfRuns): the temperature the mix would reach if it ran.
	ReachedC *float64 `json:"reached_c,omitempty"`
	Boils    bool     `json:"boils,omitempty"`
}

// GasJudged is a gas hazard in numbers: the amount released and the
// equilibrium concentration in the headspace against its limit.
type GasJudged struct {
	Formula      string  `json:"formula"`
	Mol          float64 `json:"mol"`
	VolumeL      float64 `json:"volume_l"`
	HeadspaceL   float64 `json:"headspace_l"`
	HeadspacePPM float64 `json:"headspace_ppm"`
	LimitName    string  `json:"limit_name"` // IDLH, ceiling, LFL, O2
	LimitPPM     float64 `json:"limit_ppm"`
	Ratio        float64 `json:"ratio"` // headspace concentration / limit (or room concentration / limit when RoomPPM is set)
	// RoomPPM, for an asphyxiant judged by its amount (CO2), is the
	// concentration the gas would make spread over a small plant room,
	// set when that, not the headspace, gives Ratio.
	RoomPPM float64 `json:"room_ppm,omitempty"`
	// Outside names the fast reaction that gives the gas beyond the
	// equilibrium state (aqua regia, bromide with concentrated sulfuric
	// acid), when one does.
	Outside     string `json:"outside_reaction,omitempty"`
	LimitSource string `json:"limit_source"`
	HenrySource string `json:"henry_source"`
	// Method says where HeadspacePPM came from: "vapour table" (the
	// partial pressure over a solution of the liquid's strength,
	// data/vapour.txt) or "mixed state" (Henry's law or the mixed state's
	// activities). StrengthPct is the % w/w of the gas's free solute in the
	// liquid the vapour table was read at; VapourSource its rows' sources.
	Method       string  `json:"figure_method,omitempty"`
	StrengthPct  float64 `json:"strength_pct,omitempty"`
	VapourSource string  `json:"vapour_source,omitempty"`
	// ColdPPM, when the mix's own heat drives the gas out (the Henry
	// constant moved to the temperature reached), is the headspace
	// concentration at the streams' temperature: what a mix dosed slowly
	// and kept cool holds, compared with the streams alone.
	ColdPPM float64 `json:"cold_ppm,omitempty"`
	// LowerBound: the liquid is stronger than the vapour table's last row,
	// whose figure HeadspacePPM then is: the real one is higher.
	LowerBound bool `json:"lower_bound,omitempty"`
	// ClosedRiseBar, when the request states a headspace the gas
	// overfills at the ambient pressure, is the pressure rise (bar above
	// the ambient) this gas alone would give if the vessel were really
	// closed: ideal gas at the mix's temperature, all of it as gas. The
	// words and the action for it are the gas-pressure hazard's, which
	// counts every gas the mix gives off, in any headspace.
	ClosedRiseBar float64 `json:"closed_rise_bar,omitempty"`
	// DissolvedMol, when the gas fills the headspace at the ambient
	// pressure, is what stays dissolved in the saturated liquid (given
	// when it is at least half of Mol): it keeps coming off an open tank.
	DissolvedMol float64 `json:"dissolved_mol,omitempty"`
	// Forerunner, when set, names what the mixed state takes the gas's
	// atoms on to (cyanogen chloride on its way to cyanate): Mol is then
	// the worst case of an intermediate, not an amount beside the
	// state's products.
	Forerunner string `json:"intermediate_before,omitempty"`
}

// HeatJudged is a heat hazard in numbers.
type HeatJudged struct {
	ReleasedkJ float64 `json:"released_kj"`
	ReachedC   float64 `json:"reached_c"`
	Boils      bool    `json:"boils"`
	// StatekJ is the part of ReleasedkJ from the mixed state (reactions
	// that proceed, neutralisation, dissolving), given when Reactions adds
	// the heat of reactions judged as families to it.
	StatekJ   *float64       `json:"state_kj,omitempty"`
	Reactions []ReactionHeat `json:"reactions,omitempty"`
	// IfRuns is the heat of each runaway a hazard names that does not run
	// in the mix as made (ammonium with nitrite, cold and not acid): not
	// counted in ReleasedkJ, shown as what it would give off if it ran.
	IfRuns []ReactionHeat `json:"if_runs,omitempty"`
	// SteamKg is the water a boiling mix boils off as steam (the heat past
	// the boiling point over water's enthalpy of vaporisation), and
	// SteamRiseBar what that steam alone would raise a stated closed
	// headspace by, ideal gas at 100 °C.
	SteamKg      float64 `json:"steam_kg,omitempty"`
	SteamRiseBar float64 `json:"steam_rise_bar,omitempty"`
}

// Amounts is the stoichiometry of the headline reaction.
type Amounts struct {
	Limiting  *string    `json:"limiting"`
	ExtentMol float64    `json:"extent_mol"`
	Consumed  []AmountOf `json:"consumed"`
	Formed    []AmountOf `json:"formed"`
}

// AmountOf is an amount of one species.
type AmountOf struct {
	Text  string  `json:"text"`
	Mol   float64 `json:"mol"`
	Phase Phase   `json:"phase,omitempty"`
}

// GasRelease is a gas given off by the mix.
type GasRelease struct {
	Text     string  `json:"text"`
	Mol      float64 `json:"mol"`
	VolumeL  float64 `json:"volume_l"`
	VolumeM3 float64 `json:"volume_m3"`
	// Kind is "formed" for a gaseous reaction product, "volatile" for a
	// dissolved gas (CO2 from carbonate and acid, H2S, SO2) beyond what the
	// liquid holds at the stated pressure.
	Kind string `json:"kind"`
	// PartialKPa is the gas's partial pressure over the mix at equilibrium;
	// HeadspacePPM the same as a share of the headspace air, by volume.
	// Kind "headspace" marks a gas that stays dissolved but fills a closed
	// headspace as large as the liquid volume: Mol is what that holds.
	PartialKPa   float64 `json:"partial_kpa"`
	HeadspacePPM float64 `json:"headspace_ppm"`
	// LiquidMol, for Kind "headspace", is what stays dissolved as the
	// neutral molecule once the headspace holds Mol: the two add up to the
	// molecule the mixed state holds (the headspace is not extra gas). A
	// gas the state gives off as a bubble too small to fill the headspace
	// has it as well: the closed headspace of air takes more out of the
	// liquid than the bubble at the ambient pressure, and Mol and
	// LiquidMol add up to the bubble and the dissolved molecule.
	LiquidMol float64 `json:"liquid_mol,omitempty"`
}

// Heat is the heat estimate of the mix (all reactions, neutralisation included).
type Heat struct {
	DeltaHkJPerMol   *float64 `json:"delta_h_kj_per_mol"`
	HeatReleasedkJ   *float64 `json:"heat_released_kj"`
	TemperatureRiseC *float64 `json:"temperature_rise_c"`
	NeutralisationkJ float64  `json:"neutralisation_kj"`
	DissolutionkJ    float64  `json:"dissolution_kj"` // heat of dissolving solid or near-pure reagents and of diluting concentrated ones, included in HeatReleasedkJ
	// DilutionkJ is the part of DissolutionkJ from the heats of concentrated
	// solutions (data/dilution.txt): each stream's strength against the mix's.
	DilutionkJ float64  `json:"dilution_kj,omitempty"`
	Assumption string   `json:"assumption"`
	Missing    []string `json:"missing,omitempty"` // species without formation-enthalpy data
	// NotDissolvedCounted names the solid or near-pure reagents whose heat
	// of dissolving is not in the figure (no formation enthalpy on record):
	// the figure may then be far from the truth, in either direction.
	NotDissolvedCounted []string `json:"dissolving_not_counted,omitempty"`
	// LeftOutBoundkJ bounds what the figure leaves out when a species of
	// Missing is made or used up on the whole: it is counted as its nearest
	// form with ΔfH° plus hydroxide and water, and the heat of forming it
	// from that form (at most this many kJ in all) is not counted.
	LeftOutBoundkJ *float64 `json:"left_out_bound_kj,omitempty"`
	// GibbsStandIn names the species of Missing with no related form with
	// ΔfH°, counted at their ΔfG° instead (within LeftOutBoundkJ).
	GibbsStandIn []string `json:"dfg_stand_in,omitempty"`
	// Withheld says why no figure is given when it is not missing data:
	// a solid dissolved into too little water for the solution model.
	Withheld string `json:"withheld,omitempty"`
	// TemperatureReachedC is the start temperature plus the rise; Boils says
	// the estimate passed the boiling point, where the rise stops and
	// WaterFlashedKg of water boils off.
	TemperatureReachedC *float64 `json:"temperature_reached_c"`
	Boils               bool     `json:"boils"`
	// FamilyReactions are the reactions judged as families (see
	// ReactionHeat) whose heat the decision adds to HeatReleasedkJ, which
	// is the mixed state's alone; TotalReleasedkJ is the sum of both.
	FamilyReactions []ReactionHeat `json:"family_reactions,omitempty"`
	TotalReleasedkJ *float64       `json:"total_released_kj,omitempty"`
	WaterFlashedKg  *float64       `json:"water_flashed_kg,omitempty"`
	// IfRuns is the heat of each runaway a hazard names that the mix as
	// made does not run (see HeatJudged.IfRuns): not counted above.
	IfRuns []ReactionHeat `json:"if_runs,omitempty"`
}

// Step is one follow-on reaction, predicted on what the previous one left.
type Step struct {
	Oxidizer      *Couple   `json:"oxidizer"`
	Reducer       *Couple   `json:"reducer"`
	Reaction      *Reaction `json:"reaction"`
	ECellStandard *float64  `json:"e_cell_standard_v"`
	ECell         *float64  `json:"e_cell_v"`
	Spontaneous   bool      `json:"spontaneous"`
	Verdict       Verdict   `json:"verdict"`
	DeltaGkJ      *float64  `json:"delta_g_kj"`
	Log10K        *float64  `json:"log10_k"`
	Amounts       *Amounts  `json:"amounts"`
}

// Conditions are the conditions of the mix after combining the streams.
type Conditions struct {
	PH           float64  `json:"ph"`
	PHStated     bool     `json:"ph_stated"`
	PHFinal      *float64 `json:"ph_final"` // pH of the mix at equilibrium, after every change
	TemperatureK float64  `json:"temperature_k"`
	TemperatureC float64  `json:"temperature_c"`
	PressureKPa  float64  `json:"pressure_kpa"`
	VolumeL      float64  `json:"volume_l"`
	// HeadspaceL is the closed gas space the gas figures are for: the
	// stated one, else the liquid volume (HeadspaceStated false).
	HeadspaceL      float64 `json:"headspace_l"`
	HeadspaceStated bool    `json:"headspace_stated"`
	// Medium is the medium the half-reactions and the net equation are
	// written in (acid or base: which table form applies): the mix's as
	// combined, before any reaction, unless the change carries the mix more
	// than a pH unit past neutral to the other side. Its meaning is kept;
	// MediumFinal is the medium at PHFinal.
	Medium Medium `json:"medium"`
	// MediumFinal is the medium at the pH after every change (PHFinal):
	// acid below neutral pH at the mix temperature, base at or above; empty
	// when there is no equilibrium pH.
	MediumFinal Medium `json:"medium_final,omitempty"`
}

// Allowance was a kinetic allowance of the earlier pair ranking. The field
// stays in the JSON answer (always null) for integrations that read it; the
// kinetic locks of data/locks.txt replaced the allowances.
type Allowance struct {
	ID     string  `json:"id"`
	Volts  float64 `json:"volts"`
	Reason string  `json:"reason"`
	Source string  `json:"source"`
}

// StreamOut describes one stream of the request as the engine understood it.
type StreamOut struct {
	Text    string   `json:"text"`
	Label   string   `json:"label"`         // the tag, or what is in the stream without its amount: counts "most-asked pairs"
	Tag     string   `json:"tag,omitempty"` // catalogue tag the stream came from
	VolumeL float64  `json:"volume_l,omitempty"`
	MassKg  float64  `json:"mass_kg,omitempty"`
	PH      *float64 `json:"ph,omitempty"`
	// TemperatureC is the stream's own temperature when the request states one.
	TemperatureC *float64 `json:"temperature_c,omitempty"`
	Components   []string `json:"components"`
}
