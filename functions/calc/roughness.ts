/**
 * Typical absolute roughness of new pipe, m. Values as commonly tabulated after Moody (1944)
 * and in hydraulics texts (from memory); the real value depends on age, lining and water.
 */
import { CalcError, type CalcResult, ok, step } from "./_lib/result";

const MM = 1e-3;

/** Material name → [roughness in m, where the value comes from]. */
export const ROUGHNESS: Record<string, [number, string]> = {
  "commercial steel": [0.045 * MM, "Moody (1944): 0.00015 ft"],
  "wrought iron": [0.045 * MM, "Moody (1944): 0.00015 ft"],
  "stainless steel": [0.015 * MM, "common practice for new stainless pipe"],
  "galvanized iron": [0.15 * MM, "Moody (1944): 0.0005 ft"],
  "asphalted cast iron": [0.12 * MM, "Moody (1944): 0.0004 ft"],
  "cast iron": [0.26 * MM, "Moody (1944): 0.00085 ft"],
  "ductile iron cement lined": [0.1 * MM, "common practice for new cement-mortar lining"],
  concrete: [1.0 * MM, "Moody (1944): 0.3 to 3 mm; middle of the range"],
  "riveted steel": [3.0 * MM, "Moody (1944): 0.9 to 9 mm; low end of the range"],
  "wood stave": [0.5 * MM, "Moody (1944): 0.18 to 0.9 mm"],
  "drawn tubing": [0.0015 * MM, "Moody (1944): 0.000005 ft"],
  copper: [0.0015 * MM, "drawn tubing, Moody (1944)"],
  pvc: [0.0015 * MM, "smooth plastic, common practice"],
  hdpe: [0.007 * MM, "common practice for new polyethylene"],
};

/** Names people type for the same material. */
const ALIASES: Record<string, string> = {
  steel: "commercial steel",
  "carbon steel": "commercial steel",
  stainless: "stainless steel",
  galvanized: "galvanized iron",
  "galvanised iron": "galvanized iron",
  galvanised: "galvanized iron",
  "ductile iron": "ductile iron cement lined",
  plastic: "pvc",
  polyethylene: "hdpe",
  pe: "hdpe",
};

export function roughnessOf(material: string): CalcResult {
  const key = material.trim().toLowerCase().replace(/[-_]+/g, " ").replace(/\s+/g, " ");
  // Own entries only: text such as "constructor" must not find Object's properties.
  const name = Object.hasOwn(ROUGHNESS, key) ? key : Object.hasOwn(ALIASES, key) ? ALIASES[key] : undefined;
  if (!name) {
    throw new CalcError("material", `unknown material "${material}": expected one of ${Object.keys(ROUGHNESS).map((k) => `"${k}"`).join(", ")}`, "value");
  }
  return ok(ROUGHNESS[name][0], [`Typical new-pipe value (${ROUGHNESS[name][1]}); aged pipe can be several times rougher.`], [
    step("ε", `typical roughness of new ${name}`, ROUGHNESS[name][0], "length", `table row "${name}": ${ROUGHNESS[name][1]}`),
  ]);
}
