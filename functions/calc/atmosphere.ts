/**
 * Standard atmospheric pressure at an elevation: U.S. Standard Atmosphere 1976
 * (NOAA-S/T 76-1562), identical to ISO 2533:1975 up to 32 km geopotential.
 */
import { CalcError, type CalcResult, ok, step } from "./_lib/result";
import { STANDARD_ATMOSPHERE, STANDARD_GRAVITY } from "./_lib/constants";

/** Effective Earth radius for geopotential height, m (US 1976, r0). */
const EARTH_RADIUS = 6356766;
/** Molar mass of air, kg/mol, and the gas constant the 1976 standard uses, J/(mol·K). */
const MOLAR_MASS_AIR = 0.0289644;
const GAS_CONSTANT_1976 = 8.31432;

/** Layers: base geopotential height (m') and temperature gradient (K/m') (US 1976 table 4). */
const LAYERS: ReadonlyArray<readonly [number, number]> = [
  [0, -0.0065],
  [11000, 0],
  [20000, 0.001],
  [32000, 0.0028],
  [47000, 0],
  [51000, -0.0028],
  [71000, -0.002],
];
const TOP_GEOPOTENTIAL = 84852;
const ELEVATION_MIN = -5000;
const ELEVATION_MAX = 86000;

/** Geopotential height, m', from geometric elevation, m. */
function geopotentialHeight(elevation: number): number {
  return (EARTH_RADIUS * elevation) / (EARTH_RADIUS + elevation);
}

/** The layer holding geopotential height H (m'): its base height, lapse rate, base temperature and pressure; and T and p at H. */
function atmosphereAt(H: number): { hb: number; lapse: number; baseT: number; baseP: number; temperature: number; pressure: number } {
  const k = (STANDARD_GRAVITY * MOLAR_MASS_AIR) / GAS_CONSTANT_1976;
  let baseT = 288.15;
  let baseP = STANDARD_ATMOSPHERE;
  for (let i = 0; i < LAYERS.length; i++) {
    const [hb, lapse] = LAYERS[i];
    const top = i + 1 < LAYERS.length ? LAYERS[i + 1][0] : TOP_GEOPOTENTIAL;
    const dh = Math.min(H, top) - hb;
    const p = lapse === 0 ? baseP * Math.exp((-k * dh) / baseT) : baseP * Math.pow(baseT / (baseT + lapse * dh), k / lapse);
    if (H <= top || i + 1 === LAYERS.length) return { hb, lapse, baseT, baseP, temperature: baseT + lapse * dh, pressure: p };
    baseP = p;
    baseT += lapse * (top - hb);
  }
  throw new Error("unreachable: the last layer returns");
}

/** Standard atmospheric pressure, Pa absolute, at a geometric elevation above mean sea level, m. */
export function standardAtmospherePressure(elevation: number): CalcResult {
  if (!(elevation >= ELEVATION_MIN && elevation <= ELEVATION_MAX)) {
    throw new CalcError("elevation", `expected -5 km to 86 km, the range of the US Standard Atmosphere 1976; got ${elevation} m`);
  }
  const warnings: string[] = [];
  if (elevation > 11000) {
    warnings.push("Above 11 km: outside any pump site; value is the standard atmosphere's, not local weather.");
  }
  const H = geopotentialHeight(elevation);
  const a = atmosphereAt(H);
  return ok(a.pressure, warnings, [
    step("H", "geopotential height", H, "length", "US 1976 equation 18, H = r0·z/(r0 + z) with r0 = 6356766 m"),
    step("H_b", "base of the layer", a.hb, "length", "US 1976 table 4"),
    step("p_b", "pressure at the layer's base", a.baseP, "pressure", a.hb === 0 ? "sea-level standard, 101325 Pa" : "US 1976 equations 33a and 33b through the layers below"),
    step("T_b", "temperature at the layer's base, K", a.baseT, "ratio", "US 1976 table 4 (288.15 K at sea level)"),
    step("L_b", "temperature gradient, K/m'", a.lapse, "ratio", "US 1976 table 4"),
    step("T", "temperature at H, K", a.temperature, "ratio", "T = T_b + L_b·(H − H_b)"),
    step("g0·M/R", "hydrostatic constant, K/m'", (STANDARD_GRAVITY * MOLAR_MASS_AIR) / GAS_CONSTANT_1976, "ratio", "g0 = 9.80665 m/s², M = 0.0289644 kg/mol, R = 8.31432 J/(mol·K) (US 1976)"),
  ]);
}
