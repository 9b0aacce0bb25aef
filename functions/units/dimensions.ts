/**
 * The physical dimensions worksheet arguments and results can have, each with the project's
 * base unit (what a bare number means) and an example for messages and docs.
 */
import type { StepDimension } from "../calc/_lib/result";

export interface DimensionInfo {
  /** Unit a bare number is read in, as mathjs spells it. */
  base: string;
  /** How the base unit is printed for people. */
  baseLabel: string;
  /** Noun for messages: "expected a length". */
  noun: string;
  /** A text quantity of this dimension, for messages and docs. */
  example: string;
  /** Magnitudes (base units) outside which a bare number is implausible for pump and pipe work. */
  plausible?: readonly [number, number];
}

export const DIMENSIONS = {
  length: { base: "m", baseLabel: "m", noun: "a length", example: '"6 in"', plausible: [1e-7, 1e5] },
  area: { base: "m^2", baseLabel: "m²", noun: "an area", example: '"12 in^2"' },
  flow: { base: "m^3/s", baseLabel: "m³/s", noun: "a volume flow", example: '"400 gpm"', plausible: [1e-8, 200] },
  velocity: { base: "m/s", baseLabel: "m/s", noun: "a velocity", example: '"8 ft/s"', plausible: [1e-5, 500] },
  pressure: { base: "Pa", baseLabel: "Pa", noun: "a pressure", example: '"35 psi"', plausible: [1, 1e9] },
  power: { base: "W", baseLabel: "W", noun: "a power", example: '"15 kW"', plausible: [0.1, 1e9] },
  energy: { base: "J", baseLabel: "J", noun: "an energy", example: '"1200 kWh"' },
  density: { base: "kg/m^3", baseLabel: "kg/m³", noun: "a density", example: '"998 kg/m^3"', plausible: [300, 3000] },
  viscosity: { base: "Pa s", baseLabel: "Pa·s", noun: "a dynamic viscosity", example: '"1 cP"', plausible: [1e-5, 100] },
  kinematicViscosity: { base: "m^2/s", baseLabel: "m²/s", noun: "a kinematic viscosity", example: '"1 cSt"', plausible: [1e-8, 0.1] },
  temperature: { base: "degC", baseLabel: "°C", noun: "a temperature", example: '"68 degF"' },
  rotationalSpeed: { base: "rpm", baseLabel: "rpm", noun: "a rotational speed", example: '"1750 rpm"', plausible: [10, 1e5] },
  angle: { base: "deg", baseLabel: "°", noun: "an angle", example: '"30 deg"' },
  modulus: { base: "Pa", baseLabel: "Pa", noun: "an elastic modulus", example: '"200 GPa"' },
  time: { base: "h", baseLabel: "h", noun: "a running time", example: '"6000 h"' },
  ratio: { base: "", baseLabel: "—", noun: "a plain number", example: "0.5" },
  efficiency: { base: "", baseLabel: "fraction", noun: "an efficiency", example: '0.78 or "78%"' },
} as const satisfies Record<StepDimension, DimensionInfo>;

export type Dimension = keyof typeof DIMENSIONS;

/** Dimensions whose values carry a physical unit (everything but plain numbers). */
export function hasUnit(dim: Dimension): boolean {
  return DIMENSIONS[dim].base !== "";
}
