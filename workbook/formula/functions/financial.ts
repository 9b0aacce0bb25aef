/**
 * Financial functions an engineer uses for life-cycle costs, written from their pages in
 * Microsoft's Excel function reference ("Financial functions (reference)"): the time-value
 * equation of PV's page (pv·(1+r)^n + pmt·(1+r·type)·((1+r)^n − 1)/r + fv = 0), NPV and IRR,
 * MIRR, XNPV and XIRR, depreciation, and nominal and effective rates. RATE, IRR and XIRR solve by
 * Newton's method from the guess, then by bisection over a bracket where Newton fails.
 */
import type { Ctx } from "../evaluate";
import { err, finite, FormulaError, type Value } from "../values";
import { array, def, type Defs, flat, num, numbersOf, numeric, optNum } from "./_lib";
import { serialFromIso } from "../serial";

function fv(r: number, n: number, pmt: number, pv: number, type: number): number {
  if (r === 0) return -(pv + pmt * n);
  const g = Math.pow(1 + r, n);
  return -(pv * g + (pmt * (1 + r * type) * (g - 1)) / r);
}

function pmtOf(r: number, n: number, pv: number, fvv: number, type: number): number {
  if (r === 0) return -(pv + fvv) / n;
  const g = Math.pow(1 + r, n);
  return (-(fvv + pv * g) * r) / ((1 + r * type) * (g - 1));
}

function ipmt(r: number, per: number, n: number, pv: number, fvv: number, type: number): number {
  const p = pmtOf(r, n, pv, fvv, type);
  if (type === 1) return per === 1 ? 0 : (fv(r, per - 2, p, pv, 1) - p) * r;
  return fv(r, per - 1, p, pv, 0) * r;
}

function typeArg(args: Value[], i: number): number {
  const t = optNum(args, i, 0);
  return t === 0 ? 0 : 1;
}

/** A root of f by Newton's method from a guess (numeric derivative), else by bisection over a bracket found by scanning. */
function solveRate(f: (r: number) => number, guess: number, name: string): number {
  let r = guess;
  for (let i = 0; i < 100; i++) {
    const y = f(r);
    if (!Number.isFinite(y)) break;
    const h = Math.max(1e-7, Math.abs(r) * 1e-7);
    const d = (f(r + h) - f(r - h)) / (2 * h);
    if (!d || !Number.isFinite(d)) break;
    const next = r - y / d;
    if (!Number.isFinite(next) || next <= -1) break;
    if (Math.abs(next - r) <= 1e-15 * Math.max(1, Math.abs(r))) return next;
    r = next;
    if (i === 99 && Math.abs(f(r)) < 1e-9) return r;
  }
  // Bisection over a bracket of rates from just above -100 %.
  const grid = [-0.999999, -0.99, -0.9, -0.5, -0.2, -0.1, 0, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 100, 1000];
  for (let k = 0; k + 1 < grid.length; k++) {
    let lo = grid[k];
    let hi = grid[k + 1];
    let flo = f(lo);
    const fhi = f(hi);
    if (!Number.isFinite(flo) || !Number.isFinite(fhi) || flo * fhi > 0) continue;
    for (let i = 0; i < 300; i++) {
      const mid = (lo + hi) / 2;
      const fm = f(mid);
      if (fm === 0 || hi - lo < 1e-16 * Math.max(1, Math.abs(mid))) return mid;
      if (fm * flo < 0) hi = mid;
      else {
        lo = mid;
        flo = fm;
      }
    }
    return (lo + hi) / 2;
  }
  throw err("#NUM!", `${name} found no rate: check the signs of the cash flows and the guess`);
}

function npv(r: number, xs: number[]): number {
  let s = 0;
  for (let i = 0; i < xs.length; i++) s += xs[i] / Math.pow(1 + r, i + 1);
  return s;
}

function cashFlows(v: Value, c: Ctx): number[] {
  return numbersOf([v], c);
}

function datedFlows(values: Value, dates: Value, c: Ctx, name: string): { v: number[]; d: number[] } {
  const v = flat(array(values, c)).map((x) => {
    if (x instanceof FormulaError) throw x;
    if (typeof x !== "number") throw err("#VALUE!", `${name}: every value must be a number`);
    return x;
  });
  const d = flat(array(dates, c)).map((x) => {
    if (x instanceof FormulaError) throw x;
    const n = typeof x === "string" ? serialFromIso(x) : typeof x === "number" ? x : undefined;
    if (n === undefined) throw err("#VALUE!", `${name}: every date must be a date`);
    return Math.floor(n);
  });
  if (v.length !== d.length) throw err("#NUM!", `${name}: values and dates differ in number`);
  if (d.some((x) => x < d[0])) throw err("#NUM!", `${name}: a date precedes the first`);
  return { v, d };
}

function xnpv(r: number, v: number[], d: number[]): number {
  return v.reduce((s, x, i) => s + x / Math.pow(1 + r, (d[i] - d[0]) / 365), 0);
}

function cumulative(args: Value[], principal: boolean, name: string): number {
  const [r, nRaw, pv, sRaw, eRaw] = args.slice(0, 5).map(num);
  const n = Math.trunc(nRaw);
  const s = Math.trunc(sRaw);
  const e = Math.trunc(eRaw);
  const t = num(args[5]);
  if (r <= 0 || n <= 0 || pv <= 0 || s < 1 || e < s || e > n || (t !== 0 && t !== 1)) throw err("#NUM!", `${name}: check rate, nper, pv, the periods and type`);
  let sum = 0;
  const p = pmtOf(r, n, pv, 0, t);
  for (let per = s; per <= e; per++) {
    const i = ipmt(r, per, n, pv, 0, t);
    sum += principal ? p - i : i;
  }
  return sum;
}

export const FINANCIAL: Defs = {
  CUMIPMT: def(6, 6, "s", (args) => cumulative(args, false, "CUMIPMT")),
  CUMPRINC: def(6, 6, "s", (args) => cumulative(args, true, "CUMPRINC")),
  DB: numeric(4, 5, ([cost, salvage, life, period, month]) => {
    month = Math.trunc(month);
    if (cost < 0 || salvage < 0 || life <= 0 || period <= 0 || month < 1 || month > 12 || period > life + (month < 12 ? 1 : 0)) return err("#NUM!", "DB: check cost, salvage, life, period and month");
    if (cost === 0) return 0;
    const rate = Math.round((1 - Math.pow(salvage / cost, 1 / life)) * 1000) / 1000;
    let total = (cost * rate * month) / 12;
    if (Math.trunc(period) === 1) return total;
    for (let p = 2; p <= Math.trunc(period); p++) {
      const dep = p === Math.trunc(life) + 1 ? ((cost - total) * rate * (12 - month)) / 12 : (cost - total) * rate;
      if (p === Math.trunc(period)) return dep;
      total += dep;
    }
    return 0;
  }, [undefined, undefined, undefined, undefined, 12]),
  DDB: numeric(4, 5, ([cost, salvage, life, period, factor]) => {
    if (cost < 0 || salvage < 0 || life <= 0 || period <= 0 || factor <= 0 || period > life) return err("#NUM!", "DDB: check cost, salvage, life, period and factor");
    let total = 0;
    let dep = 0;
    for (let p = 1; p <= Math.ceil(period); p++) {
      dep = Math.min((cost - total) * (factor / life), Math.max(0, cost - salvage - total));
      total += dep;
    }
    return dep;
  }, [undefined, undefined, undefined, undefined, 2]),
  EFFECT: numeric(2, 2, ([r, n]) => {
    n = Math.trunc(n);
    if (r <= 0 || n < 1) return err("#NUM!", "EFFECT: nominal_rate above 0, npery 1 or more");
    return Math.pow(1 + r / n, n) - 1;
  }),
  FV: numeric(3, 5, ([r, n, p, pv, type]) => finite(fv(r, n, p, pv, type ? 1 : 0)), [undefined, undefined, undefined, 0, 0]),
  IPMT: def(4, 6, "s", (args) => {
    const [r, per, n, pv] = args.slice(0, 4).map(num);
    if (per < 1 || per > n) return err("#NUM!", "IPMT: per must be from 1 to nper");
    return finite(ipmt(r, per, n, pv, optNum(args, 4, 0), typeArg(args, 5)));
  }),
  IRR: def(1, 2, "as", (args, c) => {
    const xs = cashFlows(args[0], c);
    if (!xs.some((x) => x > 0) || !xs.some((x) => x < 0)) return err("#NUM!", "IRR needs at least one positive and one negative value");
    const guess = optNum(args, 1, 0.1);
    return solveRate((r) => xs.reduce((s, x, i) => s + x / Math.pow(1 + r, i), 0), guess, "IRR");
  }),
  MIRR: def(3, 3, "ass", (args, c) => {
    const xs = cashFlows(args[0], c);
    const fr = num(args[1]);
    const rr = num(args[2]);
    const n = xs.length;
    const pos = xs.map((x) => (x > 0 ? x : 0));
    const neg = xs.map((x) => (x < 0 ? x : 0));
    const npvNeg = npv(fr, neg);
    if (npvNeg === 0 || !pos.some((x) => x)) return err("#DIV/0!", "MIRR needs at least one positive and one negative value");
    return finite(Math.pow((-npv(rr, pos) * Math.pow(1 + rr, n)) / (npvNeg * (1 + fr)), 1 / (n - 1)) - 1);
  }),
  NOMINAL: numeric(2, 2, ([e, n]) => {
    n = Math.trunc(n);
    if (e <= 0 || n < 1) return err("#NUM!", "NOMINAL: effect_rate above 0, npery 1 or more");
    return n * (Math.pow(1 + e, 1 / n) - 1);
  }),
  NPER: numeric(3, 5, ([r, p, pv, fvv, type]) => {
    const t = type ? 1 : 0;
    if (r === 0) return p === 0 ? err("#NUM!", "NPER: pmt is 0") : -(pv + fvv) / p;
    const a = p * (1 + r * t) - fvv * r;
    const b = p * (1 + r * t) + pv * r;
    if (a / b <= 0) return err("#NUM!", "NPER: the payments never reach the future value");
    return finite(Math.log(a / b) / Math.log(1 + r));
  }, [undefined, undefined, undefined, 0, 0]),
  NPV: def(2, 255, "sv", (args, c) => {
    const r = num(args[0]);
    if (r === -1) return err("#DIV/0!", "NPV at a rate of -100 %");
    return finite(npv(r, numbersOf(args.slice(1), c)));
  }),
  PMT: numeric(3, 5, ([r, n, pv, fvv, type]) => (n === 0 ? err("#NUM!", "PMT: nper is 0") : finite(pmtOf(r, n, pv, fvv, type ? 1 : 0))), [undefined, undefined, undefined, 0, 0]),
  PPMT: def(4, 6, "s", (args) => {
    const [r, per, n, pv] = args.slice(0, 4).map(num);
    if (per < 1 || per > n) return err("#NUM!", "PPMT: per must be from 1 to nper");
    const fvv = optNum(args, 4, 0);
    const t = typeArg(args, 5);
    return finite(pmtOf(r, n, pv, fvv, t) - ipmt(r, per, n, pv, fvv, t));
  }),
  PV: numeric(3, 5, ([r, n, p, fvv, type]) => {
    const t = type ? 1 : 0;
    if (r === 0) return -(fvv + p * n);
    const g = Math.pow(1 + r, n);
    return finite(-(fvv + (p * (1 + r * t) * (g - 1)) / r) / g);
  }, [undefined, undefined, undefined, 0, 0]),
  RATE: numeric(3, 6, ([n, p, pv, fvv, type, guess]) => {
    const t = type ? 1 : 0;
    return solveRate((r) => (r === 0 ? pv + p * n + fvv : pv * Math.pow(1 + r, n) + (p * (1 + r * t) * (Math.pow(1 + r, n) - 1)) / r + fvv), guess, "RATE");
  }, [undefined, undefined, undefined, 0, 0, 0.1]),
  SLN: numeric(3, 3, ([cost, salvage, life]) => (life === 0 ? err("#DIV/0!", "SLN: life is 0") : (cost - salvage) / life)),
  SYD: numeric(4, 4, ([cost, salvage, life, per]) => {
    if (life <= 0 || per <= 0 || per > life) return err("#NUM!", "SYD: per must be from 1 to life");
    return ((cost - salvage) * (life - per + 1) * 2) / (life * (life + 1));
  }),
  XIRR: def(2, 3, "aas", (args, c) => {
    const { v, d } = datedFlows(args[0], args[1], c, "XIRR");
    if (!v.some((x) => x > 0) || !v.some((x) => x < 0)) return err("#NUM!", "XIRR needs at least one positive and one negative value");
    return solveRate((r) => xnpv(r, v, d), optNum(args, 2, 0.1), "XIRR");
  }),
  XNPV: def(3, 3, "saa", (args, c) => {
    const r = num(args[0]);
    const { v, d } = datedFlows(args[1], args[2], c, "XNPV");
    return finite(xnpv(r, v, d));
  }),
};
