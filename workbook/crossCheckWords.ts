/**
 * The words and symbols by which a hand sheet labels each quantity a cross-check maps: data, so
 * that a new spelling is one more entry. A word matches a whole word of the label in any case
 * ("Reynolds number", "vapor pressure"); a symbol matches a whole token of the label in its own
 * case ("Re", "D", "ΣK", "ε/D"). US and British spellings both.
 */
interface Vocabulary {
  words: readonly string[];
  symbols: readonly string[];
}

const VOCABULARY: Readonly<Record<string, Vocabulary>> = {
  flow: { words: ["flow", "flow rate", "discharge", "capacity", "duty flow"], symbols: ["Q"] },
  diameter: { words: ["diameter", "diam", "inside diameter", "bore", "ID"], symbols: ["D", "d", "ID"] },
  length: { words: ["length", "pipe length", "run"], symbols: ["L"] },
  roughness: { words: ["roughness", "absolute roughness", "epsilon"], symbols: ["ε", "eps", "k_s", "ks"] },
  kinematic_viscosity: { words: ["kinematic viscosity", "viscosity"], symbols: ["ν", "nu"] },
  density: { words: ["density", "mass density"], symbols: ["ρ", "rho"] },
  head: { words: ["head", "pump head", "total head", "TDH", "lift"], symbols: ["H"] },
  efficiency: { words: ["efficiency", "eff", "pump efficiency"], symbols: ["η", "eta"] },
  temperature: { words: ["temperature", "temp", "water temperature"], symbols: ["T", "t"] },
  surface_pressure: { words: ["surface pressure", "atmospheric pressure", "barometric pressure", "tank pressure", "pressure", "atm"], symbols: ["p_s", "ps", "p_atm", "patm", "P_atm"] },
  liquid_height: { words: ["level", "liquid level", "height", "static head", "elevation", "submergence"], symbols: ["z", "Z", "h_s"] },
  suction_loss: { words: ["suction loss", "suction line loss", "friction loss", "loss", "losses"], symbols: ["h_L", "hL", "h_f", "hf"] },
  velocity: { words: ["velocity", "speed of flow"], symbols: ["V", "v"] },
  reynolds: { words: ["reynolds", "reynolds number"], symbols: ["Re", "Re_D", "Red"] },
  relative_roughness: { words: ["relative roughness"], symbols: ["ε/D", "e/D", "k/D", "eps/D"] },
  k_total: { words: ["K total", "total K", "sum of K", "fittings", "minor loss coefficient", "loss coefficient", "resistance coefficient"], symbols: ["K", "ΣK", "∑K", "Ktot", "K_total", "SumK"] },
  c_factor: { words: ["Hazen", "C factor", "Hazen-Williams C"], symbols: ["C", "C_HW"] },
  npsha: { words: ["NPSHa", "NPSH available"], symbols: ["NPSHa", "NPSHA"] },
  npshr: { words: ["NPSHr", "NPSH required", "NPSH3"], symbols: ["NPSHr", "NPSHR"] },
  vapour_pressure: { words: ["vapour pressure", "vapor pressure", "saturation pressure"], symbols: ["p_v", "pv", "Pv", "P_v"] },
  gravity: { words: ["gravity", "gravitational acceleration", "acceleration of gravity"], symbols: ["g"] },
};

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&");

/** Letters, digits and symbol characters: what a whole token is made of. */
const TOKEN = "A-Za-z0-9_ΣΔεηνρ∑/";

/**
 * How well a label names a quantity: by a word, 2 plus the longest word's length ("vapor
 * pressure" names the vapour pressure better than "pressure" names a surface pressure); by a
 * symbol, 1; not at all, 0.
 */
export function labelScore(label: string, quantity: string): number {
  const v = VOCABULARY[quantity];
  if (!v || !label) return 0;
  // The unit in brackets is not part of the name: "(m³/h)" never names a Q.
  const name = label.replace(/[([][^()[\]]*[)\]]/g, " ");
  const words = v.words.filter((w) => new RegExp(`(^|[^A-Za-z])${escape(w)}([^A-Za-z]|$)`, "i").test(name));
  if (words.length) return 2 + Math.max(...words.map((w) => w.length));
  if (v.symbols.some((s) => new RegExp(`(^|[^${TOKEN}])${escape(s)}([^${TOKEN}]|$)`).test(name))) return 1;
  return 0;
}

/** True when the label names another quantity better than `quantity` ("Vapor pressure" is no surface pressure). */
export function namesAnother(label: string, quantity: string): boolean {
  const own = labelScore(label, quantity);
  return Object.keys(VOCABULARY).some((q) => q !== quantity && labelScore(label, q) > own);
}

/** The words hand sheets use for Nappe's intermediate values, by the step's symbol: the longest one a label holds wins ("vapor pressure head" over "pressure head"). */
export const STEP_WORDS: Readonly<Record<string, readonly string[]>> = {
  V: ["velocity", "mean velocity"],
  Re: ["reynolds"],
  "ε/D": ["relative roughness"],
  f: ["friction factor"],
  "V²/2g": ["velocity head", "dynamic head"],
  P_h: ["hydraulic power", "water power", "ρgQH"],
  "p_s/ρg": ["pressure head", "surface pressure head", "atmospheric head", "atmospheric pressure head"],
  "p_v/ρg": ["vapour pressure head", "vapor pressure head", "vapour head", "vapor head"],
  A: ["area", "flow area"],
};

