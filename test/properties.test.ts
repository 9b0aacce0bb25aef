/** Property-based tests (fast-check) of the calculation core: finite results and physical laws. */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { affinityScale } from "../functions/calc/affinity";
import { colebrookFriction, frictionFactor } from "../functions/calc/friction";
import { darcyHeadLoss, hazenWilliamsHeadLoss } from "../functions/calc/headLoss";
import { headFromPressure, pressureFromHead } from "../functions/calc/hydrostatics";
import { operatingPoint } from "../functions/calc/operatingPoint";
import { interpolant } from "../functions/calc/pumpCurve";
import { waterDensity, waterViscosity, saturationPressure } from "../functions/calc/water";
import { convertUnits } from "../functions/units/quantity";

const RUNS = { numRuns: 500 };
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

/** Pipe sizes and flows engineers meet: 5 mm to 3 m bore, 0.01 to 10 m/s. */
const pipe = fc.record({
  d: fc.double({ min: 0.005, max: 3, noNaN: true }),
  v: fc.double({ min: 0.01, max: 10, noNaN: true }),
  length: fc.double({ min: 0.1, max: 20000, noNaN: true }),
  rr: fc.double({ min: 0, max: 0.01, noNaN: true }),
  nu: fc.double({ min: 1e-7, max: 1e-4, noNaN: true }),
});
const flowOf = (d: number, v: number) => (v * Math.PI * d * d) / 4;

describe("valid inputs never give NaN or Infinity", () => {
  it("friction, head loss and Hazen–Williams", () => {
    fc.assert(
      fc.property(pipe, ({ d, v, length, rr, nu }) => {
        const q = flowOf(d, v);
        for (const x of [
          darcyHeadLoss(q, d, length, rr * d, nu).value,
          hazenWilliamsHeadLoss(q, d, length, 100).value,
          frictionFactor((v * d) / nu, rr, "colebrook").value,
          frictionFactor((v * d) / nu, rr, "churchill").value,
        ]) {
          expect(Number.isFinite(x) && x >= 0).toBe(true);
        }
      }),
      RUNS,
    );
  });
  it("water properties across the liquid range", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 350, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (t, frac) => {
        const pSat = saturationPressure(t).value;
        const p = pSat + frac * (100e6 - pSat);
        for (const x of [waterDensity(t, p).value, waterViscosity(t, p).value]) expect(Number.isFinite(x) && x > 0).toBe(true);
      }),
      RUNS,
    );
  });
});

describe("physical laws hold", () => {
  it("head loss grows with flow", () => {
    fc.assert(
      fc.property(pipe, fc.double({ min: 1.0001, max: 5, noNaN: true }), ({ d, v, length, rr, nu }, k) => {
        const q = flowOf(d, v);
        expect(darcyHeadLoss(k * q, d, length, rr * d, nu).value).toBeGreaterThan(darcyHeadLoss(q, d, length, rr * d, nu).value);
      }),
      RUNS,
    );
  });
  it("head loss grows with length", () => {
    fc.assert(
      fc.property(pipe, fc.double({ min: 1.0001, max: 5, noNaN: true }), ({ d, v, length, rr, nu }, k) => {
        const q = flowOf(d, v);
        expect(darcyHeadLoss(q, d, k * length, rr * d, nu).value).toBeGreaterThan(darcyHeadLoss(q, d, length, rr * d, nu).value);
      }),
      RUNS,
    );
  });
  it("the friction factor falls as Re rises in smooth pipe (turbulent Colebrook)", () => {
    fc.assert(
      fc.property(fc.double({ min: 4000, max: 1e8, noNaN: true }), fc.double({ min: 1.001, max: 10, noNaN: true }), (re, k) => {
        expect(colebrookFriction(re * k, 0)).toBeLessThan(colebrookFriction(re, 0));
      }),
      RUNS,
    );
  });
  it("HEAD and PRESSURE invert each other", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e8, max: 1e8, noNaN: true }), fc.double({ min: 1, max: 20000, noNaN: true }), (p, rho) => {
        const back = pressureFromHead(headFromPressure(p, rho).value, rho).value;
        expect(Math.abs(back - p)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(p)));
      }),
      RUNS,
    );
  });
  it("CONVERT there and back returns the value", () => {
    const groups = [
      ["m", "ft", "in", "mm", "km", "mi"],
      ["gpm", "L/s", "m^3/h", "MGD", "cfs", "lpm"],
      ["Pa", "kPa", "psi", "bar", "ftH2O", "mH2O", "inHg", "atm"],
      ["W", "kW", "hp", "BTU/h"],
      ["degC", "degF", "K", "degR"],
      ["cP", "Pa s", "poise"],
    ];
    fc.assert(
      fc.property(fc.constantFrom(...groups), fc.nat(), fc.nat(), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (g, i, j, x) => {
        const [a, b] = [g[i % g.length], g[j % g.length]];
        const back = convertUnits(convertUnits(x, a, b), b, a);
        expect(Math.abs(back - x)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(x)));
      }),
      RUNS,
    );
  });
  it("affinity scaling by r then 1/r is the identity", () => {
    fc.assert(
      fc.property(fc.constantFrom("flow", "head", "npshr", "power" as const), fc.double({ min: 0.2, max: 3, noNaN: true }), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (kind, r, x) => {
        const back = affinityScale(affinityScale(x, kind, r).value, kind, 1 / r).value;
        expect(Math.abs(back - x)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(x)));
      }),
      RUNS,
    );
  });
  it("the operating point lies on both curves", () => {
    // A falling pump curve H = H0(1 − (Q/Qmax)²)·s, a system curve Hs + kQ² crossing it.
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 300, noNaN: true }),
        fc.double({ min: 0.001, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }),
        (h0, qmax, staticFrac, crossFrac) => {
          const x = [0, 0.2, 0.4, 0.6, 0.8, 1].map((t) => t * qmax);
          const y = x.map((q) => h0 * (1 - 0.8 * (q / qmax) ** 2));
          const pump = interpolant({ x, y });
          const hs = staticFrac * h0 * 0.2;
          const qc = crossFrac * qmax;
          const k = (pump.at(qc) - hs) / (qc * qc);
          const p = operatingPoint(pump, (q) => hs + k * q * q).value;
          // The system curve was built to cross the pump curve at qc: that is the answer, known in advance.
          expect(rel(p.flow, qc)).toBeLessThan(1e-9);
          expect(rel(p.head, hs + k * qc * qc)).toBeLessThan(1e-9);
        },
      ),
      RUNS,
    );
  });
});
