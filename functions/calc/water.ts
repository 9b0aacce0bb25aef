/**
 * Properties of liquid water.
 *
 * - Density: IAPWS-IF97 region 1 (IAPWS R7-97(2012), equation 7 and table 2).
 * - Saturation pressure and temperature: IAPWS-IF97 region 4 (equations 30 and 31, table 34).
 * - Dynamic viscosity: IAPWS R12-08 (2008) formulation for industrial use (μ2 = 1).
 *
 * Temperatures are in °C at this boundary (the project's convention) and in kelvin inside.
 */
import { CalcError, type CalcResult, ok, type Step, step } from "./_lib/result";
import { ZERO_CELSIUS } from "./_lib/constants";

/** Specific gas constant of water used by IF97, J/(kg·K). */
const R_IF97 = 461.526;

// IF97 table 2: region 1 coefficients I, J, n.
const R1_I = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32];
const R1_J = [-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6, -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41];
const R1_N = [
  0.14632971213167, -0.84548187169114, -0.3756360367204e1, 0.33855169168385e1, -0.95791963387872,
  0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3, 0.28319080123804e-3, -0.60706301565874e-3,
  -0.18990068218419e-1, -0.32529748770505e-1, -0.21841717175414e-1, -0.5283835796993e-4, -0.47184321073267e-3,
  -0.30001780793026e-3, 0.47661393906987e-4, -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
  -0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908e-5, -0.65171222895601e-6, -0.14341729937924e-12,
  -0.40516996860117e-6, -0.12734301741641e-8, -0.17424871230634e-9, -0.68762131295531e-18, 0.14478307828521e-19,
  0.26335781662795e-22, -0.11947622640071e-22, 0.18228094581404e-23, -0.93537087292458e-25,
];

// IF97 table 34: region 4 coefficients n1..n10.
const N4 = [
  0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5, -0.32325550322333e7,
  0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849, 0.65017534844798e3,
];

/** Range in which the region 1 equation is used here: 0 °C to 350 °C, up to 100 MPa. */
const LIQUID_T_MIN_C = 0;
const LIQUID_T_MAX_C = 350;
const LIQUID_P_MAX_PA = 100e6;
/** Region 4 range: triple point (273.16 K is the definition; IF97 uses 273.15 K) to critical point. */
const SAT_T_MIN_K = 273.15;
const SAT_T_MAX_K = 647.096;
const SAT_P_MIN_PA = 611.213;

/** IF97 region 1 at T in K and p in Pa: reduced pressure π, inverse reduced temperature τ, γ_π and the specific volume, m³/kg. */
function if97Region1(temperatureK: number, pressurePa: number): { pi: number; tau: number; gammaPi: number; volume: number } {
  const pi = pressurePa / 16.53e6;
  const tau = 1386 / temperatureK;
  let gammaPi = 0;
  for (let i = 0; i < R1_N.length; i++) {
    gammaPi -= R1_N[i] * R1_I[i] * Math.pow(7.1 - pi, R1_I[i] - 1) * Math.pow(tau - 1.222, R1_J[i]);
  }
  return { pi, tau, gammaPi, volume: (pi * gammaPi * R_IF97 * temperatureK) / pressurePa };
}

/** IF97 region 1 specific volume, m³/kg, at T in K and p in Pa (no range checks). */
export function if97Region1SpecificVolume(temperatureK: number, pressurePa: number): number {
  return if97Region1(temperatureK, pressurePa).volume;
}

/** IF97 region 4 (equation 30) at T in K: the transformed temperature ϑ, the quadratic's A, B, C, and the saturation pressure, Pa. */
function if97Region4(temperatureK: number): { theta: number; A: number; B: number; C: number; pressure: number } {
  const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N4;
  const theta = temperatureK + n9 / (temperatureK - n10);
  const A = theta * theta + n1 * theta + n2;
  const B = n3 * theta * theta + n4 * theta + n5;
  const C = n6 * theta * theta + n7 * theta + n8;
  return { theta, A, B, C, pressure: Math.pow((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C)), 4) * 1e6 };
}

/** IF97 region 4 saturation pressure, Pa, at T in K (equation 30). */
export function if97SaturationPressure(temperatureK: number): number {
  return if97Region4(temperatureK).pressure;
}

/** IF97 region 4 saturation temperature, K, at p in Pa (equation 31, the backward equation). */
export function if97SaturationTemperature(pressurePa: number): number {
  const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N4;
  const beta = Math.pow(pressurePa / 1e6, 0.25);
  const E = beta * beta + n3 * beta + n6;
  const F = n1 * beta * beta + n4 * beta + n7;
  const G = n2 * beta * beta + n5 * beta + n8;
  const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G));
  return (n10 + D - Math.sqrt((n10 + D) * (n10 + D) - 4 * (n9 + n10 * D))) / 2;
}

/** IAPWS 2008 viscosity from T in K and density in kg/m³, critical enhancement μ2 = 1: T̄, ρ̄, μ̄0, μ̄1 and μ in Pa·s. */
function iapws2008(temperatureK: number, density: number): { Tbar: number; rhoBar: number; mu0: number; mu1: number; viscosity: number } {
  const Tbar = temperatureK / 647.096;
  const rhoBar = density / 322.0;
  const H0 = [1.67752, 2.20462, 0.6366564, -0.241605];
  let denominator = 0;
  for (let i = 0; i < 4; i++) denominator += H0[i] / Math.pow(Tbar, i);
  const mu0 = (100 * Math.sqrt(Tbar)) / denominator;
  // Table 2 of the release: H[i][j], i = 0..5 (powers of 1/T̄ − 1), j = 0..6 (powers of ρ̄ − 1).
  const H = [
    [5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0, 0],
    [8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0, 0, 0],
    [-1.08374, 1.88797, -7.72479e-1, 0, 0, 0, 0],
    [-2.89555e-1, 1.26613, -4.89837e-1, 0, 6.98452e-2, 0, -4.35673e-3],
    [0, 0, -2.5704e-1, 0, 0, 8.72102e-3, 0],
    [0, 1.20573e-1, 0, 0, 0, 0, -5.93264e-4],
  ];
  let sum = 0;
  for (let i = 0; i < 6; i++) {
    let inner = 0;
    for (let j = 0; j < 7; j++) inner += H[i][j] * Math.pow(rhoBar - 1, j);
    sum += Math.pow(1 / Tbar - 1, i) * inner;
  }
  const mu1 = Math.exp(rhoBar * sum);
  return { Tbar, rhoBar, mu0, mu1, viscosity: mu0 * mu1 * 1e-6 };
}

/** IAPWS 2008 viscosity, Pa·s, from T in K and density in kg/m³, critical enhancement μ2 = 1. */
export function iapws2008Viscosity(temperatureK: number, density: number): number {
  return iapws2008(temperatureK, density).viscosity;
}

/** Saturation (vapour) pressure of water, Pa, at a temperature in °C. */
export function saturationPressure(temperatureC: number): CalcResult {
  const T = temperatureC + ZERO_CELSIUS;
  if (!(T >= SAT_T_MIN_K && T <= SAT_T_MAX_K)) {
    throw new CalcError("temperature", `expected 0 °C to 373.946 °C (the IF97 saturation line); got ${temperatureC} °C`);
  }
  const r = if97Region4(T);
  return ok(r.pressure, [], [
    step("T", "absolute temperature, K", T, "ratio", "T = t + 273.15"),
    step("ϑ", "transformed temperature, K", r.theta, "ratio", "IAPWS-IF97 equation 29b, ϑ = T + n9/(T − n10)"),
    step("A", "quadratic coefficient A", r.A, "ratio", "IAPWS-IF97 equation 30, A = ϑ² + n1·ϑ + n2"),
    step("B", "quadratic coefficient B", r.B, "ratio", "IAPWS-IF97 equation 30, B = n3·ϑ² + n4·ϑ + n5"),
    step("C", "quadratic coefficient C", r.C, "ratio", "IAPWS-IF97 equation 30, C = n6·ϑ² + n7·ϑ + n8"),
  ]);
}

/** Checks that (T, p) is compressed or saturated liquid inside IF97 region 1; throws otherwise. */
function requireLiquid(temperatureC: number, pressurePa: number): void {
  if (!(temperatureC >= LIQUID_T_MIN_C && temperatureC <= LIQUID_T_MAX_C)) {
    throw new CalcError("temperature", `expected liquid water between ${LIQUID_T_MIN_C} °C and ${LIQUID_T_MAX_C} °C; got ${temperatureC} °C`);
  }
  if (!(pressurePa > 0 && pressurePa <= LIQUID_P_MAX_PA)) {
    throw new CalcError("pressure", `expected an absolute pressure above 0 and up to 100 MPa; got ${pressurePa} Pa`);
  }
  const pSat = if97SaturationPressure(temperatureC + ZERO_CELSIUS);
  if (pressurePa < pSat) {
    const tBoil = if97SaturationTemperature(Math.max(pressurePa, SAT_P_MIN_PA)) - ZERO_CELSIUS;
    throw new CalcError(
      "temperature",
      `water at ${temperatureC} °C is steam at ${(pressurePa / 1000).toPrecision(5)} kPa absolute: it boils at ` +
        `${tBoil.toFixed(2)} °C there (needs at least ${(pSat / 1000).toPrecision(5)} kPa to stay liquid)`,
    );
  }
}

/** The IF97 region 1 steps of a density: T, π, τ, γ_π and the specific volume. */
function densitySteps(temperatureC: number, pressurePa: number): { density: number; steps: Step[] } {
  const T = temperatureC + ZERO_CELSIUS;
  const r = if97Region1(T, pressurePa);
  return {
    density: 1 / r.volume,
    steps: [
      step("T", "absolute temperature, K", T, "ratio", "T = t + 273.15"),
      step("π", "reduced pressure", r.pi, "ratio", "IAPWS-IF97 region 1, π = p/16.53 MPa"),
      step("τ", "inverse reduced temperature", r.tau, "ratio", "IAPWS-IF97 region 1, τ = 1386 K/T"),
      step("γ_π", "∂γ/∂π of the region 1 Gibbs free energy", r.gammaPi, "ratio", "IAPWS-IF97 equation 7 with table 2, 34 terms"),
      step("v", "specific volume, m³/kg", r.volume, "ratio", "IAPWS-IF97 table 3, v = π·γ_π·R·T/p with R = 461.526 J/(kg·K)"),
    ],
  };
}

/** Liquid water density, kg/m³, at temperature in °C and absolute pressure in Pa (IF97 region 1). */
export function waterDensity(temperatureC: number, pressurePa: number): CalcResult {
  requireLiquid(temperatureC, pressurePa);
  const { density, steps } = densitySteps(temperatureC, pressurePa);
  return ok(density, [], steps);
}

/** The IAPWS 2008 steps of a viscosity: ρ (IF97), T̄, ρ̄, μ̄0, μ̄1. */
function viscositySteps(temperatureC: number, pressurePa: number): { viscosity: number; density: number; steps: Step[] } {
  requireLiquid(temperatureC, pressurePa);
  const { density } = densitySteps(temperatureC, pressurePa);
  const r = iapws2008(temperatureC + ZERO_CELSIUS, density);
  return {
    viscosity: r.viscosity,
    density,
    steps: [
      step("ρ", "density", density, "density", "IAPWS-IF97 region 1"),
      step("T̄", "reduced temperature", r.Tbar, "ratio", "IAPWS 2008, T̄ = T/647.096 K"),
      step("ρ̄", "reduced density", r.rhoBar, "ratio", "IAPWS 2008, ρ̄ = ρ/322 kg/m³"),
      step("μ̄0", "dilute-gas viscosity, µPa·s", r.mu0, "ratio", "IAPWS 2008 equation 11, table 1"),
      step("μ̄1", "residual factor", r.mu1, "ratio", "IAPWS 2008 equation 12, table 2; critical enhancement μ̄2 = 1 (industrial use)"),
    ],
  };
}

/** Liquid water dynamic viscosity, Pa·s (IAPWS 2008 with the IF97 density). */
export function waterViscosity(temperatureC: number, pressurePa: number): CalcResult {
  const { viscosity, steps } = viscositySteps(temperatureC, pressurePa);
  return ok(viscosity, [], steps);
}

/** Liquid water kinematic viscosity, m²/s: dynamic viscosity over density. */
export function waterKinematicViscosity(temperatureC: number, pressurePa: number): CalcResult {
  const { viscosity, density, steps } = viscositySteps(temperatureC, pressurePa);
  return ok(viscosity / density, [], [...steps, step("μ", "dynamic viscosity", viscosity, "viscosity", "IAPWS 2008, μ = μ̄0·μ̄1 µPa·s")]);
}
