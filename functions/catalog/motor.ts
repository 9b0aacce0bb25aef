import { MOTOR_SERIES, motorSize } from "../calc/motor";
import { DESIGN_AID, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "MOTOR.SIZE",
    topic: "motor",
    purpose: "Next standard motor rating at or above a power plus a margin.",
    params: [
      { name: "power", kind: "quantity", dim: "power", description: "Power the motor must deliver (shaft power of the pump)." },
      { name: "series", kind: "choice", options: MOTOR_SERIES, optional: true, default: "nema", defaultNote: "NEMA (hp ratings)", description: '"NEMA" (hp ratings, default) or "IEC" (kW ratings).' },
      { name: "margin", kind: "quantity", dim: "efficiency", optional: true, default: 0, defaultNote: "0, no margin", description: 'Fraction added to the power before choosing (0.15 or "15%"); 0 when left out.' },
      unitParam('"hp" or "kW"'),
    ],
    result: { dim: "power", description: "Motor rating, W." },
    equation: String.raw`P_{motor} = \min\{R \in \text{series} : R \ge P\,(1 + m)\}`,
    derivation: (n) => `P·(1 + m) = ${n.arg("power")}·(1 + ${n.arg("margin")}) = ${n.step("P(1 + m)")} ⇒ next rating ${n.result}`,
    assumptions: ["Continuous duty, service factor not used up; the power is what the pump can draw at its worst point."],
    validity: ["Powers above the largest listed rating are an error."],
    cautions: [DESIGN_AID, "Motors, starters and wiring follow the electrical code; ask a licensed electrical engineer."],
    sources: ["NEMA MG 1 standard horsepower ratings (from memory)", "IEC 60072-1 rated outputs (from memory)"],
    examples: [
      { args: ["41 hp", "nema", null, "hp"], expect: 50, source: "NEMA MG 1 ratings: 40 then 50 hp" },
      { args: ["41 kW", "iec", 0.1, "kW"], expect: 55, source: "IEC 60072-1 ratings: 45.1 kW needed, 45 then 55 kW" },
    ],
    compute: (a) => motorSize(a.power, a.series, a.margin),
  }),
];
