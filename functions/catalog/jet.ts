import { jetHeight, jetReach, jetVelocity, nozzleFlow } from "../calc/jet";
import { JET_CAUTION, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec, type QuantityParam } from "./types";

const velocity = { name: "velocity", kind: "quantity", dim: "velocity", description: "Jet velocity at the nozzle." } as const satisfies QuantityParam;
const NO_DRAG = "Air drag, wind and jet break-up neglected (ideal projectile).";
const PROJECTILE = "Projectile motion under standard gravity (any mechanics text)";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "JET.VELOCITY",
    topic: "jet",
    purpose: "Velocity of a jet issuing under a head (Torricelli).",
    params: [
      { name: "height", kind: "quantity", dim: "length", description: "Head across the nozzle (pressure head plus elevation)." },
      {
        name: "velocity_coefficient",
        kind: "quantity",
        dim: "ratio",
        optional: true,
        default: 1,
        defaultNote: "1, an ideal nozzle: real nozzles run about 0.95 to 0.99",
        description: "Nozzle velocity coefficient Cv; 1 (ideal) when left out.",
      },
      unitParam('"ft/s" or "m/s"'),
    ],
    result: { dim: "velocity", description: "Jet velocity, m/s." },
    equation: String.raw`v = C_v \sqrt{2 g h}`,
    derivation: (n) => `v = Cv·√(2gh) = ${n.arg("velocity_coefficient")}·${n.step("√(2gh)")} = ${n.result}`,
    assumptions: ["Cv = 1 unless given: an ideal, loss-free nozzle."],
    validity: ["Head of zero or more; 0 < Cv ≤ 1."],
    cautions: [JET_CAUTION],
    sources: ["Torricelli's theorem; Bernoulli equation along a streamline"],
    examples: [{ args: [1], expect: Math.sqrt(2 * 9.80665), source: "Torricelli: v = √(2gh) at h = 1 m (definition)" }],
    compute: (a) => jetVelocity(a.height, a.velocity_coefficient),
  }),
  defineSpec({
    id: "JET.HEIGHT",
    topic: "jet",
    purpose: "Height a jet rises above its nozzle, air drag neglected.",
    params: [
      velocity,
      { name: "angle", kind: "quantity", dim: "angle", optional: true, default: 90, defaultNote: "90°, a vertical jet", description: "Elevation angle above horizontal in degrees; 90 (vertical) when left out." },
      unitParam('"ft" or "m"'),
    ],
    result: { dim: "length", description: "Rise above the nozzle, m." },
    equation: String.raw`z = \frac{(v \sin\theta)^2}{2g}`,
    derivation: (n) => `z = (v·sinθ)²/2g = (${n.step("v·sinθ")})²/(2·${n.g}) = ${n.result}`,
    assumptions: [NO_DRAG],
    validity: ["Angle from 0° to 90°."],
    cautions: [JET_CAUTION, "Real jets fall well short of this height, more so for small nozzles and high velocities."],
    sources: [PROJECTILE],
    examples: [
      { args: [10], expect: 100 / (2 * 9.80665), source: "Projectile motion: v²/2g for a vertical jet (definition)" },
      { args: [10, 30], expect: 25 / (2 * 9.80665), source: "Projectile motion: (v sin 30°)²/2g (definition)" },
    ],
    compute: (a) => jetHeight(a.velocity, a.angle),
  }),
  defineSpec({
    id: "JET.REACH",
    topic: "jet",
    purpose: "Horizontal throw of a jet, air drag neglected.",
    params: [
      velocity,
      { name: "angle", kind: "quantity", dim: "angle", description: "Elevation angle above horizontal, degrees." },
      { name: "drop", kind: "quantity", dim: "length", optional: true, default: 0, defaultNote: "0: the jet lands at nozzle height", description: "How far below the nozzle the jet lands (negative: above it); 0 when left out." },
      unitParam('"ft" or "m"'),
    ],
    result: { dim: "length", description: "Horizontal distance from the nozzle, m." },
    equation: String.raw`x = v\cos\theta\; t, \quad t = \frac{v\sin\theta + \sqrt{(v\sin\theta)^2 + 2 g\,\Delta z}}{g}`,
    derivation: (n) => `x = v·cosθ·t = ${n.step("v·cosθ")}·${n.step("t")} s = ${n.result}`,
    assumptions: [NO_DRAG],
    validity: ["Angle from 0° to 90°; a landing point higher than the jet can reach is an error."],
    cautions: [JET_CAUTION, "Real throws are much shorter than this, more so in wind."],
    sources: [PROJECTILE],
    examples: [
      { args: [10, 45], expect: 100 / 9.80665, source: "Projectile motion: range v²/g at 45° on level ground (definition)" },
      { args: [10, 0, 4.903325], expect: 10, source: "Projectile motion: horizontal jet falls 4.903 m in 1 s" },
    ],
    compute: (a) => jetReach(a.velocity, a.angle, a.drop),
  }),
  defineSpec({
    id: "NOZZLE.FLOW",
    topic: "jet",
    purpose: "Flow through a nozzle or orifice under a head.",
    params: [
      { name: "diameter", kind: "quantity", dim: "length", description: "Nozzle outlet (or orifice) diameter." },
      { name: "head", kind: "quantity", dim: "length", description: "Head across the nozzle." },
      {
        name: "discharge_coefficient",
        kind: "quantity",
        dim: "ratio",
        optional: true,
        default: 1,
        defaultNote: "1, an ideal nozzle: smooth nozzles run about 0.95 to 0.99, sharp orifices about 0.6",
        description: "Discharge coefficient Cd; 1 (ideal) when left out.",
      },
      unitParam('"gpm" or "L/s"'),
    ],
    result: { dim: "flow", description: "Flow, m³/s." },
    equation: String.raw`Q = C_d\,\frac{\pi D^2}{4}\sqrt{2 g h}`,
    derivation: (n) => `Q = Cd·A·√(2gh) = ${n.arg("discharge_coefficient")}·${n.step("A")}·${n.step("√(2gh)")} = ${n.result}`,
    assumptions: ["Cd = 1 unless given: an ideal nozzle with no contraction or loss.", "Approach velocity neglected (nozzle much smaller than the pipe)."],
    validity: ["Diameter greater than zero; head of zero or more; 0 < Cd ≤ 1."],
    cautions: [JET_CAUTION],
    sources: ["Orifice and nozzle equation (Bernoulli with a discharge coefficient), as in ISO 5167 and hydraulics texts"],
    examples: [
      { args: ["25 mm", 10, 1], expect: (Math.PI * 0.025 ** 2) / 4 * Math.sqrt(2 * 9.80665 * 10), source: "Orifice equation (definition)" },
    ],
    compute: (a) => nozzleFlow(a.diameter, a.head, a.discharge_coefficient),
  }),
];
