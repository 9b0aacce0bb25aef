import { FITTINGS, fittingK } from "../calc/fittings";
import { PIPE_SCHEDULES, pipeInsideDiameter } from "../calc/pipeSchedule";
import { ROUGHNESS, roughnessOf } from "../calc/roughness";
import { unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "PIPE.ID",
    topic: "pipe",
    purpose: "Inside diameter of steel pipe from its nominal size and schedule.",
    params: [
      { name: "nps", kind: "text", description: 'Nominal pipe size: 6, 0.5 or "1-1/2" (NPS 1/8 to 24).' },
      { name: "schedule", kind: "text", description: `Schedule: 40, "STD", "XS", "40S", ... (${PIPE_SCHEDULES.join(", ")}).` },
      unitParam('"in" or "mm"'),
    ],
    result: { dim: "length", description: "Inside diameter, m." },
    equation: String.raw`ID = OD - 2t`,
    derivation: (n) => `ID = OD − 2t = ${n.step("OD")} − 2·${n.step("t")} = ${n.result} (NPS ${n.arg("nps")}, schedule ${n.arg("schedule")})`,
    assumptions: ["Nominal dimensions: mill tolerance on the wall (−12.5 %) and any lining are not included."],
    validity: ["Sizes and schedules the standards do not list are an error."],
    cautions: [],
    sources: ["ASME B36.10M, Welded and Seamless Wrought Steel Pipe", "ASME B36.19M, Stainless Steel Pipe (S schedules)"],
    examples: [
      { args: [6, 40, "in"], expect: 6.065, source: "ASME B36.10M: NPS 6 Sch 40, OD 6.625 in, wall 0.280 in (from memory)" },
      { args: ["1-1/2", "80", "in"], expect: 1.5, source: "ASME B36.10M: NPS 1-1/2 Sch 80, OD 1.900 in, wall 0.200 in (from memory)" },
      { args: [12, "STD", "in"], expect: 12, source: "ASME B36.10M: NPS 12 STD, OD 12.750 in, wall 0.375 in (from memory)" },
    ],
    compute: (a) => pipeInsideDiameter(a.nps, a.schedule),
  }),
  defineSpec({
    id: "PIPE.ROUGHNESS",
    topic: "pipe",
    purpose: "Typical absolute roughness of new pipe of a material.",
    params: [{ name: "material", kind: "text", description: `Material: ${Object.keys(ROUGHNESS).map((k) => `"${k}"`).join(", ")}.` }, unitParam('"mm" or "ft"')],
    result: { dim: "length", description: "Absolute roughness ε, m." },
    equation: String.raw`\varepsilon \text{ from a table of typical values}`,
    derivation: (n) => `ε = ${n.result} for ${n.arg("material")}`,
    assumptions: ["New, clean pipe; age, scale and biofilm can make pipe several times rougher."],
    validity: ["Unknown materials are an error listing the known ones."],
    cautions: [],
    sources: ["Moody, L. F. (1944), Trans. ASME 66, 671–684, and common hydraulics texts (values from memory)"],
    examples: [{ args: ["commercial steel", "mm"], expect: 0.045, source: "Moody (1944): commercial steel 0.00015 ft = 0.045 mm (from memory)" }],
    compute: (a) => roughnessOf(a.material),
  }),
  defineSpec({
    id: "FITTING.K",
    topic: "pipe",
    purpose: "Loss coefficient K of a fitting or valve in pipe of a given inside diameter.",
    params: [
      { name: "fitting", kind: "text", description: `Fitting: ${Object.keys(FITTINGS).map((k) => `"${k}"`).join(", ")}.` },
      { name: "diameter", kind: "quantity", dim: "length", description: "Inside diameter of the pipe (sets f_T); not used for entrances and exits." },
    ],
    result: { dim: "ratio", description: "Loss coefficient K (referred to the velocity in this diameter)." },
    equation: String.raw`K = f_T\,\frac{L}{D}, \quad \frac{1}{\sqrt{f_T}} = -2\log_{10}\frac{\varepsilon}{3.7D}, \ \varepsilon = 0.045\ \text{mm}`,
    derivation: (n) => (n.has("f_T") ? `K = f_T·(L/D) = ${n.step("f_T")}·${n.step("L/D")} = ${n.result}, f_T at ε/D = ${n.step("ε/D")}` : `K = ${n.result} (fixed for ${n.arg("fitting")})`),
    assumptions: ["Valves fully open; f_T of clean commercial steel pipe; fixed K for entrances and exits."],
    validity: ["Unknown fittings are an error listing the known ones."],
    cautions: [],
    sources: ["Crane Technical Paper 410, Flow of Fluids through Valves, Fittings and Pipe (L/D and K values, from memory)"],
    examples: [
      { args: ["elbow 90", "6.065 in"], expect: 0.45, tolerance: 0.02, source: "Crane TP-410: standard elbow K = 30 f_T with f_T = 0.015 for NPS 6 (from memory)" },
      { args: ["exit", 0.1], expect: 1, source: "Crane TP-410: pipe exit K = 1.0" },
    ],
    compute: (a) => fittingK(a.fitting, a.diameter),
  }),
];
