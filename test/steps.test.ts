/**
 * Intermediate values: every calculation a reviewer checks by hand records the steps between
 * its inputs and its result (velocity, Reynolds number, friction factor, velocity head, vapour
 * pressure head, the crossing of two curves, ...), each checked here against an outside value.
 */
import { describe, expect, it } from "vitest";
import type { Step } from "../functions/calc/_lib/result";
import { CATALOG_BY_ID } from "../functions/catalog";
import { evaluate } from "../functions/bind/evaluate";
import { callView } from "../workbook/callView";
import { derivationText } from "../workbook/derivation";
import { relativeError, run } from "./helpers";
import colebrook from "./reference/colebrook_reference.json";
import curves from "./reference/curve_reference.json";

const G = 9.80665; // standard gravity, NIST SP 811
const stepOf = (steps: readonly Step[], symbol: string) => {
  const s = steps.find((x) => x.symbol === symbol);
  if (!s) throw new Error(`no step ${symbol} in ${steps.map((x) => x.symbol).join(", ")}`);
  return s.value;
};

describe("intermediate values", () => {
  it("HEADLOSS records V, Re, ε/D, f and V²/2g; f matches Colebrook solved with mpmath at 40 digits", () => {
    const row = colebrook.rows.find((r) => r.reynolds === 1e5 && r.relative_roughness === 1e-4)!;
    const d = 0.1;
    const nu = 1e-6;
    const q = (row.reynolds * Math.PI * d * nu) / 4; // so that Re = 4Q/(πDν) = 1e5
    const steps = run("HEADLOSS", q, d, 100, row.relative_roughness * d, nu).steps;
    const v = q / ((Math.PI * d * d) / 4); // continuity
    expect(relativeError(stepOf(steps, "V"), v)).toBeLessThan(1e-14);
    expect(relativeError(stepOf(steps, "Re"), row.reynolds)).toBeLessThan(1e-12);
    expect(relativeError(stepOf(steps, "ε/D"), row.relative_roughness)).toBeLessThan(1e-14);
    expect(relativeError(stepOf(steps, "f"), Number(row.f))).toBeLessThan(1e-12);
    expect(relativeError(stepOf(steps, "V²/2g"), (v * v) / (2 * G))).toBeLessThan(1e-14);
  });
  it("NPSHA records the pressure heads: vapour pressure from IAPWS-IF97 table 35 (3536.58941 Pa at 300 K)", () => {
    const steps = run("NPSHA", 101325, -3, 1, 26.85, 997).steps;
    expect(relativeError(stepOf(steps, "p_v/ρg"), 3536.58941 / (997 * G))).toBeLessThan(1e-8);
    expect(relativeError(stepOf(steps, "p_s/ρg"), 101325 / (997 * G))).toBeLessThan(1e-14);
    expect(stepOf(steps, "z")).toBe(-3);
    expect(stepOf(steps, "h_L")).toBe(1);
  });
  it("PUMP.DUTY records the crossing and both heads there (hand calculation on the parabola: Q = √(32/22000))", () => {
    const curve = [0, 0.01, 0.02, 0.03, 0.04, 0.05].map((x) => [x, 52 - 12000 * x * x]);
    const steps = run("PUMP.DUTY", curve, 20, 10000).steps;
    expect(relativeError(stepOf(steps, "Q*"), Math.sqrt(32 / 22000))).toBeLessThan(2e-3);
    expect(relativeError(stepOf(steps, "H_pump(Q*)"), stepOf(steps, "H_system(Q*)"))).toBeLessThan(1e-9);
  });
  // Every function but HEAD and PRESSURE, whose derivation is their equation with the inputs put in.
  it.each([...CATALOG_BY_ID.keys()].filter((id) => id !== "HEAD" && id !== "PRESSURE"))("NAPPE.%s records its intermediate values on each worked example", (id) => {
    const spec = CATALOG_BY_ID.get(id)!;
    for (const example of spec.examples) {
      const ev = evaluate(spec, example.args);
      expect(ev.steps.length, JSON.stringify(example.args)).toBeGreaterThan(0);
      for (const s of ev.steps) expect(Number.isFinite(s.value), `${id} ${s.symbol}`).toBe(true);
    }
  });
  it("WATER.DENSITY records the IF97 region 1 steps: v = 0.00100215168 m³/kg at 300 K, 3 MPa (IAPWS-IF97 table 5)", () => {
    const steps = run("WATER.DENSITY", "300 K", "3 MPa").steps;
    expect(stepOf(steps, "T")).toBe(300);
    expect(relativeError(stepOf(steps, "π"), 3 / 16.53)).toBeLessThan(1e-15); // π = p/p*, p* = 16.53 MPa (IF97 equation 7)
    expect(relativeError(stepOf(steps, "τ"), 1386 / 300)).toBeLessThan(1e-15); // τ = T*/T, T* = 1386 K
    expect(relativeError(stepOf(steps, "v"), 0.100215168e-2)).toBeLessThan(1e-8);
    // v = π·γ_π·R·T/p (IF97 table 3) multiplies out from the recorded steps.
    expect(relativeError((stepOf(steps, "π") * stepOf(steps, "γ_π") * 461.526 * 300) / 3e6, stepOf(steps, "v"))).toBeLessThan(1e-14);
  });
  it("WATER.VAPORPRESSURE records ϑ, A, B, C and they give 3536.58941 Pa at 300 K by equation 30 (IAPWS-IF97 table 35)", () => {
    const steps = run("WATER.VAPORPRESSURE", "300 K").steps;
    const [A, B, C] = ["A", "B", "C"].map((x) => stepOf(steps, x));
    expect(relativeError(((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C))) ** 4 * 1e6, 3536.58941)).toBeLessThan(1e-8);
    expect(relativeError(stepOf(steps, "ϑ"), 300 + -0.23855557567849 / (300 - 0.65017534844798e3))).toBeLessThan(1e-15); // equation 29b with n9, n10 of table 34
  });
  it("WATER.VISCOSITY records T̄, ρ̄, μ̄0, μ̄1 and μ = μ̄0·μ̄1 µPa·s; 1.0016 mPa·s at 20 °C (handbook, from memory)", () => {
    const ev = run("WATER.VISCOSITY", 20);
    expect(relativeError(stepOf(ev.steps, "T̄"), 293.15 / 647.096)).toBeLessThan(1e-15); // IAPWS 2008: T* = 647.096 K
    expect(relativeError(stepOf(ev.steps, "ρ̄"), stepOf(ev.steps, "ρ") / 322)).toBeLessThan(1e-15); // ρ* = 322 kg/m³
    expect(relativeError(stepOf(ev.steps, "μ̄0") * stepOf(ev.steps, "μ̄1") * 1e-6, ev.value as number)).toBeLessThan(1e-15);
    expect(relativeError(ev.value as number, 1.0016e-3)).toBeLessThan(2e-4);
  });
  it("ATMPRESSURE records the layer: at 2000 m, H = 1999.37 m' and T = 275.154 K (US Standard Atmosphere 1976 table I, from memory)", () => {
    const steps = run("ATMPRESSURE", 2000).steps;
    expect(stepOf(steps, "H")).toBeCloseTo(1999.371, 3); // H = r0·z/(r0 + z), r0 = 6356766 m (equation 18)
    expect(stepOf(steps, "T")).toBeCloseTo(275.154, 3);
    expect(stepOf(steps, "T_b")).toBe(288.15);
    expect(stepOf(steps, "L_b")).toBe(-0.0065);
  });
  it("PIPE.ID records OD 6.625 in and wall 0.280 in for NPS 6 Sch 40 (ASME B36.10M, from memory)", () => {
    const steps = run("PIPE.ID", 6, 40).steps;
    expect(relativeError(stepOf(steps, "OD"), 6.625 * 0.0254)).toBeLessThan(1e-12);
    expect(relativeError(stepOf(steps, "t"), 0.28 * 0.0254)).toBeLessThan(1e-12);
  });
  it("FITTING.K records f_T = 0.015 for NPS 6 and L/D = 30 for a standard elbow (Crane TP-410, from memory)", () => {
    const steps = run("FITTING.K", "elbow 90", "6.065 in").steps;
    expect(stepOf(steps, "L/D")).toBe(30);
    expect(Math.abs(stepOf(steps, "f_T") - 0.015)).toBeLessThan(0.0005);
  });
  it("PUMP.HEAD records the PCHIP steps: the slopes are SciPy's derivatives, and the Hermite form of the steps gives the value", () => {
    const c = curves.curves.falling;
    const table = [["Flow (m^3/s)", "Head (m)"], ...c.x.map((x, i) => [x, c.y[i]])];
    const q = 0.0275;
    const ev = run("PUMP.HEAD", q, table);
    const k = c.x.findIndex((x, i) => x <= q && q < c.x[i + 1]);
    expect(stepOf(ev.steps, "Q_k")).toBe(c.x[k]);
    expect(stepOf(ev.steps, "H_k+1")).toBe(c.y[k + 1]);
    expect(relativeError(stepOf(ev.steps, "d_k"), c.slopes[k])).toBeLessThan(1e-12); // SciPy PchipInterpolator.derivative()
    expect(relativeError(stepOf(ev.steps, "d_k+1"), c.slopes[k + 1])).toBeLessThan(1e-12);
    const [t, h] = [stepOf(ev.steps, "t"), c.x[k + 1] - c.x[k]];
    const byHand = (2 * t ** 3 - 3 * t ** 2 + 1) * c.y[k] + (t ** 3 - 2 * t ** 2 + t) * h * c.slopes[k] + (-2 * t ** 3 + 3 * t ** 2) * c.y[k + 1] + (t ** 3 - t ** 2) * h * c.slopes[k + 1];
    expect(relativeError(ev.value as number, byHand)).toBeLessThan(1e-14);
    expect(stepOf(ev.steps, "H (straight line)")).toBeCloseTo(c.y[k] + t * (c.y[k + 1] - c.y[k]), 12);
  });
  it("PUMP.POWER records H(Q), η(Q) and ρgQH, and the power is their quotient (definition, ANSI/HI 1.6)", () => {
    const spec = CATALOG_BY_ID.get("PUMP.POWER")!;
    const ev = evaluate(spec, spec.examples[0].args);
    expect(stepOf(ev.steps, "H(Q)")).toBeCloseTo(86.875 * 0.3048, 12); // SciPy PCHIP head, 86.875 ft
    expect(relativeError(stepOf(ev.steps, "P_h"), 1000 * G * (250 * 3.785411784e-3 / 60) * 86.875 * 0.3048)).toBeLessThan(1e-12);
  });
  it("CONVERT records the value in SI base units: 1 psi = 6894.757 Pa (NIST SP 811 B.8)", () => {
    expect(relativeError(stepOf(run("CONVERT", 1, "psi", "kPa").steps, "x_SI"), 6894.757293168361)).toBeLessThan(1e-12);
  });
  it("shows intermediate values in US customary units when the flow or a length was given in them", () => {
    const spec = CATALOG_BY_ID.get("HEADLOSS")!;
    const us = callView({ id: "HEADLOSS", refs: [], evaluation: evaluate(spec, ["400 gpm", "6 in", "100 ft", "0.0018 in", null, "ft"]) }, undefined, "S");
    // 400 gpm in a 6 in bore: V = 0.4085 × 400 / 36 = 4.539 ft/s (common practice formula V = 0.4085·gpm/in²).
    expect(us.steps.find((s) => s.symbol === "V")!.value).toMatch(/^4\.53\d+ ft\/s$/);
    const si = callView({ id: "HEADLOSS", refs: [], evaluation: evaluate(spec, [0.02, 0.15, 100, 4.5e-5]) }, undefined, "S");
    expect(si.steps.find((s) => s.symbol === "V")!.value).toMatch(/ m\/s$/);
  });
});

describe("derivations", () => {
  it("put HEADLOSS's numbers into its equation, and the numbers multiply out to the result (hand check)", () => {
    const spec = CATALOG_BY_ID.get("HEADLOSS")!;
    const view = callView({ id: "HEADLOSS", refs: [], evaluation: evaluate(spec, [0.02, 0.15, 100, 4.5e-5]) }, undefined, "S");
    const m = /^h_f = f·\(L\/D\)·V²\/2g = ([\d.e-]+)·\(([\d.]+) m\/([\d.]+) m\)·([\d.e-]+) m = ([\d.e-]+) m$/.exec(view.substituted!)!;
    expect(m, view.substituted).not.toBeNull();
    const [f, L, D, vh, h] = m.slice(1).map(Number);
    // Each number is written to 4 significant figures (DESIGN.md): the product agrees to within their rounding.
    expect(relativeError((f * L) / D * vh, h)).toBeLessThan(1.5e-3);
    // And the velocity head is V²/2g of V = 4Q/(πD²) (continuity), by hand.
    const v = 0.02 / ((Math.PI * 0.15 ** 2) / 4);
    expect(relativeError(vh, (v * v) / (2 * G))).toBeLessThan(5e-4);
  });
  it("writes a plain-text derivation a reviewer can paste: equation with numbers, inputs, intermediate values, result", () => {
    const spec = CATALOG_BY_ID.get("NPSHA")!;
    const view = callView({ id: "NPSHA", refs: ["B1", undefined, undefined, "B4"], evaluation: evaluate(spec, [101325, -3, 1, 20]) }, undefined, "S");
    const text = derivationText({ sheet: "S", address: "B6", formula: "NAPPE.NPSHA(B1, -3, 1, B4)" }, view);
    expect(text.split("\n")[0]).toBe("S!B6: =NAPPE.NPSHA(B1, -3, 1, B4)");
    expect(text).toMatch(/^ {2}NPSHa = p_s\/ρg − p_v\/ρg \+ z − h_L = [\d.]+ m − [\d.]+ m \+ \(-3 m\) − 1 m = 6\.112 m$/m); // catalogue example: 6.11183 m (hand calculation with steam-table values), at 4 significant figures
    expect(text).toMatch(/^ {2}surface_pressure = B1 → 101300 Pa \(101300 Pa\)$|^ {2}surface_pressure = B1 → 101300/m); // 101325 Pa to 4 significant figures
    expect(text).toMatch(/^Intermediate values:$/m);
    expect(text).toMatch(/^Result: 6\.112 m \(6\.112 m\)$|^Result: 6\.112 m$/m);
  });
  it("writes the line in US customary units when the flow or a length was given in them, and it still multiplies out", () => {
    const spec = CATALOG_BY_ID.get("HEADLOSS")!;
    const view = callView({ id: "HEADLOSS", refs: [], evaluation: evaluate(spec, ["400 gpm", "6 in", "100 ft", "0.0018 in", null, "ft"]) }, undefined, "S");
    const m = /^h_f = f·\(L\/D\)·V²\/2g = ([\d.e-]+)·\(([\d.]+) ft\/([\d.]+) ft\)·([\d.e-]+) ft = ([\d.e-]+) ft$/.exec(view.substituted!)!;
    expect(m, view.substituted).not.toBeNull();
    const [f, L, D, vh, h] = m.slice(1).map(Number);
    expect([L, D]).toEqual([100, 0.5]);
    // Each number is written to 4 significant figures (DESIGN.md): the product agrees to within their rounding.
    expect(relativeError((f * L) / D * vh, h)).toBeLessThan(1.5e-3);
    // V = 0.4085·gpm/in² = 4.539 ft/s (common practice formula); V²/2g with g = 32.174 ft/s² (NIST SP 811: 9.80665 m/s²).
    expect(relativeError(vh, (0.4085 * 400 / 36) ** 2 / (2 * 32.174))).toBeLessThan(1e-3);
  });
  it("Hazen–Williams in US units takes its US constant, 4.725 with Q in ft³/s (the common 4.73 form, from memory)", () => {
    const spec = CATALOG_BY_ID.get("HEADLOSS.HW")!;
    const view = callView({ id: "HEADLOSS.HW", refs: [], evaluation: evaluate(spec, ["500 gpm", "6 in", "1000 ft", 120, "ft"]) }, undefined, "S");
    const m = /^h = 4\.725·L·Q\^1\.852\/\(C\^1\.852·D\^4\.8704\) = 4\.725·([\d.]+) ft·\(([\d.]+) ft³\/s\)\^1\.852\/\(([\d.]+)\^1\.852·\(([\d.]+) ft\)\^4\.8704\) = ([\d.]+) ft$/.exec(view.substituted!)!;
    expect(m, view.substituted).not.toBeNull();
    const [L, Q, C, D, h] = m.slice(1).map(Number);
    expect(relativeError(Q, 500 * 0.13368055 / 60)).toBeLessThan(5e-4); // 1 gal = 0.13368 ft³ (NIST SP 811); written to 4 figures
    expect(relativeError((4.725 * L * Q ** 1.852) / (C ** 1.852 * D ** 4.8704), h)).toBeLessThan(1.5e-3);
    expect(relativeError((4.73 * L * Q ** 1.852) / (C ** 1.852 * D ** 4.87), h)).toBeLessThan(3e-3);
  });
  it("writes g as 32.174 ft/s² in a US line: 30 psi of water is about 69.3 ft (2.31 ft per psi, common practice)", () => {
    const spec = CATALOG_BY_ID.get("HEAD")!;
    const view = callView({ id: "HEAD", refs: [], evaluation: evaluate(spec, ["30 psi", null, "ft"]) }, undefined, "S");
    expect(view.substituted).toMatch(/^h = p\/\(ρg\) = 30 psi\/\(62\.3\d* lb\/ft³·32\.174 ft\/s²\) = 69\.3\d* ft$/);
    expect(view.result).toMatch(/^69\.3\d* ft$/);
  });
  it("has a derivation line for every function that records intermediate values, and it fills in", () => {
    for (const spec of [...CATALOG_BY_ID.values()]) {
      const ev = evaluate(spec, spec.examples[0].args);
      if (!ev.steps.length) continue;
      const view = callView({ id: spec.id, refs: [], evaluation: ev }, undefined, "S");
      expect(view.substituted, spec.id).toBeTruthy();
    }
  });
});
