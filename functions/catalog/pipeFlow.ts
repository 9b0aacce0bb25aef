import { meanVelocity, reynoldsNumber } from "../calc/pipeFlow";
import { diameterParam, flowParam, kinematicViscosityParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "VELOCITY",
    topic: "pipeFlow",
    purpose: "Mean velocity of a flow in a full round pipe.",
    params: [flowParam, diameterParam, unitParam('"ft/s" or "m/s"')],
    result: { dim: "velocity", description: "Mean velocity, m/s." },
    equation: String.raw`V = \frac{4Q}{\pi D^2}`,
    derivation: (n) => `V = 4Q/(πD²) = 4·${n.arg("flow")}/(π·(${n.arg("diameter")})²) = ${n.result}`,
    assumptions: ["The pipe runs full; D is the inside diameter."],
    validity: ["Flow of zero or more; diameter greater than zero."],
    cautions: [],
    sources: ["Continuity equation"],
    examples: [
      { args: ["1 ft^3/s", "1 ft", "ft/s"], expect: 4 / Math.PI, source: "Continuity: V = 4Q/(πD²) (definition)" },
    ],
    compute: (a) => meanVelocity(a.flow, a.diameter),
  }),
  defineSpec({
    id: "REYNOLDS",
    topic: "pipeFlow",
    purpose: "Reynolds number of full-pipe flow.",
    params: [flowParam, diameterParam, kinematicViscosityParam],
    result: { dim: "ratio", description: "Reynolds number (dimensionless)." },
    equation: String.raw`Re = \frac{V D}{\nu} = \frac{4Q}{\pi D \nu}`,
    derivation: (n) => `Re = V·D/ν = ${n.step("V")}·${n.arg("diameter")}/${n.arg("kinematic_viscosity")} = ${n.result}`,
    assumptions: ["The pipe runs full; D is the inside diameter."],
    validity: ["Laminar below Re = 2000, transitional to 4000, turbulent above (common practice)."],
    cautions: [],
    sources: ["Reynolds (1883); definition"],
    examples: [
      { args: ["0.2 ft^3/s", "2 in", "1.2085e-5 ft^2/s"], expect: 126400, tolerance: 2e-3, source: "Çengel & Cimbala, Fluid Mechanics, worked example on head loss in a 2-in water pipe: Re = 126 400 (from memory)" },
    ],
    compute: (a) => reynoldsNumber(a.flow, a.diameter, a.kinematic_viscosity),
  }),
];
