import { DEFAULT_PRESSURE_PA } from "../calc/_lib/constants";
import { saturationPressure, waterDensity, waterKinematicViscosity, waterViscosity } from "../calc/water";
import { unitParam } from "./_shared";
import { defineSpec, type FunctionSpec, type QuantityParam } from "./types";

const temperature = {
  name: "temperature",
  kind: "quantity",
  dim: "temperature",
  description: 'Water temperature: bare number in °C, or text such as "68 degF" or "300 K".',
} as const satisfies QuantityParam;
const pressure = {
  name: "pressure",
  kind: "quantity",
  dim: "pressure",
  optional: true,
  description: "Absolute pressure; 101.325 kPa when left out.",
  default: DEFAULT_PRESSURE_PA,
  defaultNote: "standard atmosphere, 101.325 kPa absolute",
} as const satisfies QuantityParam;
const IF97 = "IAPWS R7-97(2012): Revised Release on the IAPWS Industrial Formulation 1997 (IAPWS-IF97)";
const VISC = "IAPWS R12-08: Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water Substance";
const LIQUID = "Liquid water only: 0 °C to 350 °C, pressure at or above the saturation pressure, up to 100 MPa (IF97 region 1).";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "WATER.DENSITY",
    topic: "water",
    purpose: "Density of liquid water at a temperature and absolute pressure.",
    params: [temperature, pressure, unitParam('"kg/m^3" or "lb/ft^3"')],
    result: { dim: "density", description: "Density, kg/m³." },
    equation: String.raw`\rho = \frac{1}{v}, \quad \frac{p\,v}{R\,T} = \pi\,\gamma_\pi(\pi,\tau), \quad \pi = \frac{p}{16.53\ \text{MPa}},\ \tau = \frac{1386\ \text{K}}{T}`,
    derivation: (n) => `ρ = 1/v, v = π·γ_π·R·T/p = ${n.step("π")}·${n.step("γ_π")}·461.526 J/(kg·K)·${n.step("T")} K/${n.arg("pressure", "Pa")} = ${n.step("v")} m³/kg, so ρ = ${n.result}`,
    assumptions: ["Pure water (no dissolved salts or air).", "Pressure is absolute."],
    validity: [LIQUID, "Water above its boiling point at the given pressure is an error, not a guess."],
    cautions: [],
    sources: [`${IF97}, region 1, equation 7 and table 2`],
    examples: [
      { args: ["300 K", "3 MPa"], expect: 997.8529397865201, tolerance: 1e-8, source: "IAPWS-IF97 table 5: v = 0.100215168e-2 m³/kg at 300 K, 3 MPa" },
      { args: ["500 K", "3 MPa"], expect: 1 / 0.1202418e-2, tolerance: 1e-8, source: "IAPWS-IF97 table 5: v = 0.120241800e-2 m³/kg at 500 K, 3 MPa" },
      { args: [20, null], expect: 998.21, tolerance: 1e-4, source: "Handbook value 998.21 kg/m³ at 20 °C, 1 atm (IAPWS-95 based tables; from memory)" },
    ],
    compute: (a) => waterDensity(a.temperature, a.pressure),
  }),
  defineSpec({
    id: "WATER.VISCOSITY",
    topic: "water",
    purpose: "Dynamic viscosity of liquid water at a temperature and absolute pressure.",
    params: [temperature, pressure, unitParam('"cP" or "mPa s"')],
    result: { dim: "viscosity", description: "Dynamic viscosity, Pa·s." },
    equation: String.raw`\mu = \mu^*\,\bar\mu_0(\bar T)\,\bar\mu_1(\bar T,\bar\rho), \quad \bar\mu_0 = \frac{100\sqrt{\bar T}}{\sum_{i=0}^{3} H_i/\bar T^{i}}, \quad \bar\mu_1 = \exp\Big[\bar\rho \sum_{i=0}^{5}\big(\tfrac{1}{\bar T}-1\big)^i \sum_{j=0}^{6} H_{ij}(\bar\rho-1)^j\Big]`,
    derivation: (n) => `μ = μ*·μ̄0·μ̄1 = 1 µPa·s·${n.step("μ̄0")}·${n.step("μ̄1")} = ${n.result} at T̄ = ${n.step("T̄")}, ρ̄ = ${n.step("ρ̄")}`,
    assumptions: ["Critical enhancement μ2 = 1, as the release recommends for industrial use.", "Density from IAPWS-IF97 region 1."],
    validity: [LIQUID],
    cautions: [],
    sources: [`${VISC}, equations 10, 11, 12 and tables 1, 2`, `${IF97}, region 1`],
    examples: [
      { args: [20, null, "cP"], expect: 1.0016, tolerance: 2e-4, source: "Handbook value 1.0016 mPa·s at 20 °C, 1 atm (CRC Handbook of Chemistry and Physics; from memory)" },
    ],
    compute: (a) => waterViscosity(a.temperature, a.pressure),
  }),
  defineSpec({
    id: "WATER.KINVISC",
    topic: "water",
    purpose: "Kinematic viscosity of liquid water, dynamic viscosity over density.",
    params: [temperature, pressure, unitParam('"cSt" or "ft^2/s"')],
    result: { dim: "kinematicViscosity", description: "Kinematic viscosity, m²/s." },
    equation: String.raw`\nu = \frac{\mu}{\rho}`,
    derivation: (n) => `ν = μ/ρ = ${n.step("μ")}/${n.step("ρ")} = ${n.result}`,
    assumptions: ["μ from IAPWS 2008, ρ from IAPWS-IF97 region 1."],
    validity: [LIQUID],
    cautions: [],
    sources: [VISC, IF97],
    examples: [
      { args: [20, null, "cSt"], expect: 1.0034, tolerance: 5e-4, source: "Handbook value 1.0034 mm²/s at 20 °C, 1 atm (1.0016 mPa·s / 998.21 kg/m³; from memory)" },
    ],
    compute: (a) => waterKinematicViscosity(a.temperature, a.pressure),
  }),
  defineSpec({
    id: "WATER.VAPORPRESSURE",
    topic: "water",
    purpose: "Saturation (vapour) pressure of water at a temperature, absolute.",
    params: [temperature, unitParam('"kPa" or "psi"')],
    result: { dim: "pressure", description: "Absolute saturation pressure, Pa." },
    equation: String.raw`\frac{p_s}{1\ \text{MPa}} = \left[\frac{2C}{-B + \sqrt{B^2 - 4AC}}\right]^4, \quad \vartheta = T + \frac{n_9}{T - n_{10}}`,
    derivation: (n) => `p_s = [2C/(−B + √(B² − 4AC))]⁴·1 MPa with A = ${n.step("A")}, B = ${n.step("B")}, C = ${n.step("C")} at ϑ = ${n.step("ϑ")} K: p_s = ${n.result}`,
    assumptions: ["Pure water; result is absolute pressure."],
    validity: ["0 °C to 373.946 °C (triple point to critical point)."],
    cautions: [],
    sources: [`${IF97}, region 4, equation 30 and table 34`],
    examples: [
      { args: ["300 K"], expect: 3536.58941, tolerance: 1e-8, source: "IAPWS-IF97 table 35: ps = 0.353658941e-2 MPa at 300 K" },
      { args: ["500 K", "MPa"], expect: 2.63889776, tolerance: 1e-8, source: "IAPWS-IF97 table 35: ps = 0.263889776e1 MPa at 500 K" },
      { args: ["600 K", "MPa"], expect: 12.3443146, tolerance: 1e-8, source: "IAPWS-IF97 table 35: ps = 0.123443146e2 MPa at 600 K" },
      { args: [20, "kPa"], expect: 2.3393, tolerance: 1e-4, source: "Steam tables: 2.3393 kPa at 20 °C (IAPWS-95 based; from memory)" },
    ],
    compute: (a) => saturationPressure(a.temperature),
  }),
];
