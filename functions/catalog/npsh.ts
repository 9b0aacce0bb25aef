import { npshAvailable, npshMargin } from "../calc/npsh";
import { saturationPressure, waterDensity } from "../calc/water";
import { CAVITATION_CAUTION, DESIGN_AID, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec, numberArg } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "NPSHA",
    topic: "npsh",
    purpose: "Net positive suction head available at the pump suction.",
    params: [
      { name: "surface_pressure", kind: "quantity", dim: "pressure", description: 'Absolute pressure on the liquid surface, such as NAPPE.ATMPRESSURE(elevation) for an open tank.' },
      { name: "liquid_height", kind: "quantity", dim: "length", description: "Height of the liquid surface above the impeller eye; negative for a suction lift." },
      { name: "suction_loss", kind: "quantity", dim: "length", description: "Head loss in the suction line at the duty flow." },
      { name: "temperature", kind: "quantity", dim: "temperature", description: "Liquid temperature (sets the vapour pressure)." },
      {
        name: "density",
        kind: "quantity",
        dim: "density",
        optional: true,
        description: "Liquid density; water at the given temperature when left out.",
        default: (a) => {
          const t = numberArg(a, "temperature");
          return waterDensity(t, Math.max(numberArg(a, "surface_pressure"), saturationPressure(t).value)).value;
        },
        defaultNote: "water at the given temperature (IAPWS-IF97)",
      },
      unitParam('"ft" or "m"'),
    ],
    result: { dim: "length", description: "NPSHa, m of liquid." },
    equation: String.raw`NPSH_a = \frac{p_s - p_v}{\rho\, g} + z - h_{L,s}`,
    derivation: (n) => `NPSHa = p_s/ρg − p_v/ρg + z − h_L = ${n.step("p_s/ρg")} − ${n.step("p_v/ρg")} + (${n.step("z")}) − ${n.step("h_L")} = ${n.result}`,
    assumptions: ["Liquid is water: the vapour pressure comes from IAPWS-IF97 at the given temperature.", "Surface pressure is absolute; velocity head at the surface is negligible."],
    validity: ["A surface pressure below the vapour pressure or an NPSHa of zero or less gives a warning."],
    cautions: [CAVITATION_CAUTION, DESIGN_AID],
    sources: ["ANSI/HI 9.6.1 (NPSH margin) and ANSI/HI 1.1–1.2 definitions of NPSHa", "IAPWS-IF97 region 4 for the vapour pressure"],
    examples: [
      {
        args: [101325, -3, 1, 20],
        expect: (101325 - 2339.3) / (998.21 * 9.80665) - 4,
        tolerance: 1e-4,
        source: "Hand calculation with steam-table values at 20 °C: pv = 2.3393 kPa, ρ = 998.21 kg/m³ (from memory)",
      },
    ],
    compute: (a) =>
      npshAvailable(a.surface_pressure, a.liquid_height, a.suction_loss, saturationPressure(a.temperature).value, a.density),
  }),
  defineSpec({
    id: "NPSH.MARGIN",
    topic: "npsh",
    purpose: "NPSH margin ratio NPSHa/NPSHr, with a warning below the guideline.",
    params: [
      { name: "npsha", kind: "quantity", dim: "length", description: "NPSH available." },
      { name: "npshr", kind: "quantity", dim: "length", description: "NPSH required by the pump at the same flow (maker's NPSH3)." },
    ],
    result: { dim: "ratio", description: "Margin ratio (dimensionless)." },
    equation: String.raw`M = \frac{NPSH_a}{NPSH_r}`,
    derivation: (n) => `M = NPSHa/NPSHr = ${n.arg("npsha")}/${n.arg("npshr")} = ${n.result}`,
    assumptions: ["NPSHr is the maker's NPSH3 (3 % head drop) at the same flow and speed."],
    validity: ["Below 1: cavitation certain. Below 1.1: below the least the guideline suggests. 1.1–1.5: check the guideline for the service."],
    cautions: [CAVITATION_CAUTION],
    sources: ["ANSI/HI 9.6.1, Rotodynamic Pumps – Guideline for NPSH Margin (margin ratios 1.1 to 2.5; from memory)"],
    examples: [{ args: ["6 m", "4 m"], expect: 1.5, source: "Definition" }],
    compute: (a) => npshMargin(a.npsha, a.npshr),
  }),
];
