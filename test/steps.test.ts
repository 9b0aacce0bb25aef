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
  it.each([
    "HEADLOSS", "HEADLOSS.HW", "HEADLOSS.MINOR", "FRICTION", "REYNOLDS", "SYSTEM.HEAD", "SYSTEM.CURVE", "NPSHA", "NPSH.MARGIN", "PUMP.DUTY", "PUMP.SELECT",
    "JET.VELOCITY", "JET.HEIGHT", "JET.REACH", "NOZZLE.FLOW", "POWER.HYDRAULIC", "POWER.SHAFT", "TRIM", "SPEED", "AFFINITY.RATIO",
    "SPECIFICSPEED", "SUCTIONSPEED", "SURGE.WAVESPEED", "SURGE.PRESSURE", "ENERGY.ANNUAL", "MOTOR.SIZE",
  ])("NAPPE.%s records its intermediate values on its worked example", (id) => {
    const spec = CATALOG_BY_ID.get(id)!;
    const ev = evaluate(spec, spec.examples[0].args);
    expect(ev.steps.length).toBeGreaterThan(0);
    for (const s of ev.steps) expect(Number.isFinite(s.value), `${id} ${s.symbol}`).toBe(true);
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
    expect(relativeError((f * L) / D * vh, h)).toBeLessThan(2e-5); // six significant figures each
    // And the velocity head is V²/2g of V = 4Q/(πD²) (continuity), by hand.
    const v = 0.02 / ((Math.PI * 0.15 ** 2) / 4);
    expect(relativeError(vh, (v * v) / (2 * G))).toBeLessThan(1e-5);
  });
  it("writes a plain-text derivation a reviewer can paste: equation with numbers, inputs, intermediate values, result", () => {
    const spec = CATALOG_BY_ID.get("NPSHA")!;
    const view = callView({ id: "NPSHA", refs: ["B1", undefined, undefined, "B4"], evaluation: evaluate(spec, [101325, -3, 1, 20]) }, undefined, "S");
    const text = derivationText({ sheet: "S", address: "B6", formula: "NAPPE.NPSHA(B1, -3, 1, B4)" }, view);
    expect(text.split("\n")[0]).toBe("S!B6: =NAPPE.NPSHA(B1, -3, 1, B4)");
    expect(text).toMatch(/^ {2}NPSHa = p_s\/ρg − p_v\/ρg \+ z − h_L = [\d.]+ m − [\d.]+ m \+ \(-3 m\) − 1 m = 6\.1118\d m$/m); // catalogue example: 6.11183 m (hand calculation with steam-table values)
    expect(text).toMatch(/^ {2}surface_pressure = B1 → 101325/m);
    expect(text).toMatch(/^Intermediate values:$/m);
    expect(text).toMatch(/^Result: 6\.1118\d m$/m);
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
