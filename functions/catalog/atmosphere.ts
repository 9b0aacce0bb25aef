import { standardAtmospherePressure } from "../calc/atmosphere";
import { unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "ATMPRESSURE",
    topic: "atmosphere",
    purpose: "Standard atmospheric pressure at a site elevation, absolute.",
    params: [
      { name: "elevation", kind: "quantity", dim: "length", description: 'Elevation above mean sea level: bare number in m, or text such as "5000 ft".' },
      unitParam('"kPa", "psi" or "ftH2O"'),
    ],
    result: { dim: "pressure", description: "Absolute pressure, Pa." },
    equation: String.raw`p = p_b\left[\frac{T_b}{T_b + L_b (H - H_b)}\right]^{\frac{g_0 M}{R^* L_b}}, \quad H = \frac{r_0 z}{r_0 + z}`,
    derivation: (n) =>
      n.step("L_b") === "0"
        ? `p = p_b·exp(−(g0·M/R)·(H − H_b)/T_b) = ${n.step("p_b")}·exp(−${n.step("g0·M/R")}·(${n.step("H")} − ${n.step("H_b")})/${n.step("T_b")}) = ${n.result}`
        : `p = p_b·[T_b/T]^((g0·M/R)/L_b) = ${n.step("p_b")}·[${n.step("T_b")}/${n.step("T")}]^(${n.step("g0·M/R")}/${n.step("L_b")}) = ${n.result}, T = T_b + L_b·(H − H_b)`,
    assumptions: [
      "Standard day: the real barometric pressure varies with weather by a few percent.",
      "Elevation is geometric; it is turned into geopotential height with r0 = 6 356 766 m.",
    ],
    validity: ["−5 km to 86 km."],
    cautions: ["For NPSH at a real site, allow for low barometric pressure in storms as well as elevation."],
    sources: ["U.S. Standard Atmosphere, 1976 (NOAA-S/T 76-1562), equations 33a and 33b and table 4", "ISO 2533:1975 (identical to 32 km)"],
    examples: [
      { args: [1000], expect: 89876, tolerance: 1e-4, source: "US Standard Atmosphere 1976, table I: 8.9876E+04 Pa at 1000 m (from memory)" },
      { args: [5000, "kPa"], expect: 54.048, tolerance: 1e-4, source: "US Standard Atmosphere 1976, table I: 5.4048E+04 Pa at 5000 m (from memory)" },
      { args: [0, "kPa"], expect: 101.325, source: "US Standard Atmosphere 1976: sea-level pressure 101 325 Pa (definition)" },
    ],
    compute: (a) => standardAtmospherePressure(a.elevation),
  }),
];
