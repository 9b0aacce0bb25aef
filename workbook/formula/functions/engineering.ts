/**
 * Engineering functions, written from their pages in Microsoft's Excel function reference
 * ("Engineering functions (reference)"): CONVERT with Excel's unit names and prefixes (each
 * factor an exact definition from NIST SP 811 Appendix B where one exists), ERF and ERFC (from
 * the regularized incomplete gamma function, about 15 figures), number bases and bit operations.
 */
import { err, finite, FormulaError, type Value } from "../values";
import { def, type Defs, num, numeric, text } from "./_lib";
import { regularizedGammaP, regularizedGammaQ } from "./special";

type Dim = "mass" | "length" | "time" | "pressure" | "force" | "energy" | "power" | "magnetism" | "temperature" | "volume" | "area" | "information" | "speed";

interface Unit {
  dim: Dim;
  /** SI value of one unit (temperature: handled apart). */
  factor: number;
  /** Takes decimal prefixes (k, m, µ...), and for information binary ones (ki, Mi...). */
  prefix?: boolean;
  /** Area and volume units built on the metre take a prefix squared or cubed. */
  power?: number;
}

const LBM = 0.45359237;
const IN = 0.0254;
const FT = 0.3048;
const MI = 1609.344;
const NMI = 1852;
const LY = 9460730472580800;
const PICA_POINT = IN / 72;
const PICA = IN / 6;
const GAL = 231 * IN ** 3;
const OZ = GAL / 128;
const LBF = LBM * 9.80665;
const HP = 550 * FT * LBF;

const U = (dim: Dim, factor: number, prefix = false, power?: number): Unit => ({ dim, factor, prefix, power });

const UNITS: Record<string, Unit> = {
  // Weight and mass
  g: U("mass", 1e-3, true),
  sg: U("mass", LBF / FT),
  lbm: U("mass", LBM),
  ozm: U("mass", LBM / 16),
  grain: U("mass", LBM / 7000),
  cwt: U("mass", 100 * LBM),
  shweight: U("mass", 100 * LBM),
  uk_cwt: U("mass", 112 * LBM),
  lcwt: U("mass", 112 * LBM),
  hweight: U("mass", 112 * LBM),
  stone: U("mass", 14 * LBM),
  ton: U("mass", 2000 * LBM),
  uk_ton: U("mass", 2240 * LBM),
  LTON: U("mass", 2240 * LBM),
  brton: U("mass", 2240 * LBM),
  // Distance
  m: U("length", 1, true),
  mi: U("length", MI),
  Nmi: U("length", NMI),
  in: U("length", IN),
  ft: U("length", FT),
  yd: U("length", 3 * FT),
  ang: U("length", 1e-10, true),
  ell: U("length", 45 * IN),
  ly: U("length", LY, true),
  Pica: U("length", PICA_POINT),
  pica: U("length", PICA),
  survey_mi: U("length", (5280 * 1200) / 3937),
  // Time
  yr: U("time", 365.25 * 86400),
  day: U("time", 86400),
  d: U("time", 86400),
  hr: U("time", 3600),
  mn: U("time", 60),
  min: U("time", 60),
  sec: U("time", 1, true),
  s: U("time", 1, true),
  // Pressure
  Pa: U("pressure", 1, true),
  p: U("pressure", 1, true),
  atm: U("pressure", 101325, true),
  at: U("pressure", 101325, true),
  mmHg: U("pressure", 101325 / 760, true),
  psi: U("pressure", LBF / IN ** 2),
  Torr: U("pressure", 101325 / 760),
  // Force
  N: U("force", 1, true),
  dyn: U("force", 1e-5, true),
  dy: U("force", 1e-5, true),
  lbf: U("force", LBF),
  pond: U("force", 9.80665e-3, true),
  // Energy
  J: U("energy", 1, true),
  e: U("energy", 1e-7, true),
  c: U("energy", 4.184, true),
  cal: U("energy", 4.1868, true),
  HPh: U("energy", HP * 3600),
  hh: U("energy", HP * 3600),
  Wh: U("energy", 3600, true),
  wh: U("energy", 3600, true),
  flb: U("energy", FT * LBF),
  BTU: U("energy", 1055.05585262),
  btu: U("energy", 1055.05585262),
  // Power
  HP: U("power", HP),
  h: U("power", HP),
  PS: U("power", 75 * 9.80665),
  W: U("power", 1, true),
  w: U("power", 1, true),
  // Magnetism
  T: U("magnetism", 1, true),
  ga: U("magnetism", 1e-4, true),
  // Volume
  tsp: U("volume", OZ / 6),
  tspm: U("volume", 5e-6),
  tbs: U("volume", OZ / 2),
  oz: U("volume", OZ),
  cup: U("volume", 8 * OZ),
  pt: U("volume", 16 * OZ),
  us_pt: U("volume", 16 * OZ),
  uk_pt: U("volume", 0.00454609 / 8),
  qt: U("volume", 32 * OZ),
  uk_qt: U("volume", 0.00454609 / 4),
  gal: U("volume", GAL),
  uk_gal: U("volume", 0.00454609),
  l: U("volume", 1e-3, true),
  L: U("volume", 1e-3, true),
  lt: U("volume", 1e-3, true),
  ang3: U("volume", 1e-30, true, 3),
  ang_3: U("volume", 1e-30, true, 3),
  barrel: U("volume", 42 * GAL),
  bushel: U("volume", 2150.42 * IN ** 3),
  ft3: U("volume", FT ** 3),
  ft_3: U("volume", FT ** 3),
  in3: U("volume", IN ** 3),
  in_3: U("volume", IN ** 3),
  ly3: U("volume", LY ** 3, true, 3),
  ly_3: U("volume", LY ** 3, true, 3),
  m3: U("volume", 1, true, 3),
  m_3: U("volume", 1, true, 3),
  mi3: U("volume", MI ** 3),
  mi_3: U("volume", MI ** 3),
  yd3: U("volume", (3 * FT) ** 3),
  yd_3: U("volume", (3 * FT) ** 3),
  Nmi3: U("volume", NMI ** 3),
  Nmi_3: U("volume", NMI ** 3),
  Pica3: U("volume", PICA_POINT ** 3),
  Pica_3: U("volume", PICA_POINT ** 3),
  GRT: U("volume", 100 * FT ** 3),
  regton: U("volume", 100 * FT ** 3),
  MTON: U("volume", 40 * FT ** 3),
  // Area
  uk_acre: U("area", 4046.8564224),
  us_acre: U("area", 4046.8564224 * (1200 / 3937 / FT) ** 2),
  ang2: U("area", 1e-20, true, 2),
  ang_2: U("area", 1e-20, true, 2),
  ar: U("area", 100, true),
  ft2: U("area", FT ** 2),
  ft_2: U("area", FT ** 2),
  ha: U("area", 1e4),
  in2: U("area", IN ** 2),
  in_2: U("area", IN ** 2),
  ly2: U("area", LY ** 2, true, 2),
  ly_2: U("area", LY ** 2, true, 2),
  m2: U("area", 1, true, 2),
  m_2: U("area", 1, true, 2),
  Morgen: U("area", 2500),
  mi2: U("area", MI ** 2),
  mi_2: U("area", MI ** 2),
  Nmi2: U("area", NMI ** 2),
  Nmi_2: U("area", NMI ** 2),
  Pica2: U("area", PICA_POINT ** 2),
  Pica_2: U("area", PICA_POINT ** 2),
  yd2: U("area", (3 * FT) ** 2),
  yd_2: U("area", (3 * FT) ** 2),
  // Information
  bit: U("information", 1, true),
  byte: U("information", 8, true),
  // Speed
  admkn: U("speed", (6080 * FT) / 3600),
  kn: U("speed", NMI / 3600),
  "m/h": U("speed", 1 / 3600, true),
  "m/hr": U("speed", 1 / 3600, true),
  "m/s": U("speed", 1, true),
  "m/sec": U("speed", 1, true),
  mph: U("speed", MI / 3600),
};

const TEMPERATURES: Record<string, { toK: (x: number) => number; fromK: (k: number) => number; prefix?: boolean }> = {
  C: { toK: (x) => x + 273.15, fromK: (k) => k - 273.15 },
  cel: { toK: (x) => x + 273.15, fromK: (k) => k - 273.15 },
  F: { toK: (x) => ((x - 32) * 5) / 9 + 273.15, fromK: (k) => ((k - 273.15) * 9) / 5 + 32 },
  fah: { toK: (x) => ((x - 32) * 5) / 9 + 273.15, fromK: (k) => ((k - 273.15) * 9) / 5 + 32 },
  K: { toK: (x) => x, fromK: (k) => k, prefix: true },
  kel: { toK: (x) => x, fromK: (k) => k, prefix: true },
  Rank: { toK: (x) => (x * 5) / 9, fromK: (k) => (k * 9) / 5 },
  Reau: { toK: (x) => x * 1.25 + 273.15, fromK: (k) => (k - 273.15) * 0.8 },
};

const PREFIXES: Record<string, number> = { Y: 1e24, Z: 1e21, E: 1e18, P: 1e15, T: 1e12, G: 1e9, M: 1e6, k: 1e3, h: 1e2, da: 1e1, e: 1e1, d: 1e-1, c: 1e-2, m: 1e-3, u: 1e-6, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18, z: 1e-21, y: 1e-24 };
const BINARY_PREFIXES: Record<string, number> = { ki: 2 ** 10, Mi: 2 ** 20, Gi: 2 ** 30, Ti: 2 ** 40, Pi: 2 ** 50, Ei: 2 ** 60, Zi: 2 ** 70, Yi: 2 ** 80 };

/** A unit name with its prefix: its dimension and SI factor (or a temperature scale). */
function unitNamed(name: string): { dim: Dim; factor: number; temp?: (typeof TEMPERATURES)[string] } | undefined {
  if (UNITS[name]) return UNITS[name];
  const t = TEMPERATURES[name];
  if (t) return { dim: "temperature", factor: 1, temp: t };
  for (const [p, f] of [...Object.entries(BINARY_PREFIXES), ...Object.entries(PREFIXES)]) {
    if (!name.startsWith(p)) continue;
    const rest = name.slice(p.length);
    const u = UNITS[rest];
    const binary = p in BINARY_PREFIXES;
    if (u?.prefix && (!binary || u.dim === "information")) return { dim: u.dim, factor: u.factor * f ** (u.power ?? 1) };
    const tk = TEMPERATURES[rest];
    if (tk?.prefix && !binary) return { dim: "temperature", factor: f, temp: { toK: (x) => x * f, fromK: (k) => k / f } };
  }
  return undefined;
}

function convertUnits(x: number, from: string, to: string): number | FormulaError {
  const a = unitNamed(from);
  const b = unitNamed(to);
  if (!a) return err("#N/A", `CONVERT: "${from}" is not one of Excel's unit names (they are case-sensitive)`);
  if (!b) return err("#N/A", `CONVERT: "${to}" is not one of Excel's unit names (they are case-sensitive)`);
  if (a.dim !== b.dim) return err("#N/A", `CONVERT: "${from}" is a ${a.dim} and "${to}" a ${b.dim}`);
  if (a.dim === "temperature") return finite(b.temp!.fromK(a.temp!.toK(x)));
  return finite((x * a.factor) / b.factor);
}

/** erf(x) = sign(x)·P(1/2, x²). */
function erf(x: number): number {
  if (x === 0) return 0;
  const p = x * x < 1.5 || Math.abs(x) < 1 ? regularizedGammaP(0.5, x * x) : 1 - regularizedGammaQ(0.5, x * x);
  return x < 0 ? -p : p;
}

function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x);
  if (x * x < 1.5) return 1 - regularizedGammaP(0.5, x * x);
  return regularizedGammaQ(0.5, x * x);
}

/** Text of digits in a base, as the xxx2DEC functions read it (ten digits at most, two's complement). */
function fromBase(v: Value, radix: number, name: string): number {
  const s = text(v).trim().toUpperCase();
  if (s.length > 10 || !s.length) throw err("#NUM!", `${name}: up to 10 digits`);
  const n = parseInt(s, radix);
  if (Number.isNaN(n) || [...s].some((ch) => Number.isNaN(parseInt(ch, radix)))) throw err("#NUM!", `${name}: "${s}" is not a number in base ${radix}`);
  const bits = radix === 2 ? 10 : radix === 8 ? 30 : 40;
  return s.length === 10 && n >= 2 ** (bits - 1) ? n - 2 ** bits : n;
}

function toBase(n: number, radix: number, places: Value | undefined, name: string): string | FormulaError {
  const bits = radix === 2 ? 10 : radix === 8 ? 30 : 40;
  n = Math.trunc(n);
  if (n < -(2 ** (bits - 1)) || n >= 2 ** (bits - 1)) return err("#NUM!", `${name}: the number is outside ${bits}-bit two's complement`);
  if (n < 0) return (2 ** bits + n).toString(radix).toUpperCase();
  const s = n.toString(radix).toUpperCase();
  if (places === undefined || places === null) return s;
  const p = Math.trunc(num(places));
  if (p < s.length || p > 10) return err("#NUM!", `${name}: places must be from ${s.length} to 10`);
  return s.padStart(p, "0");
}

const conv = (from: number, to: number, name: string) =>
  def(1, 2, "s", (args) => {
    const n = from === 10 ? num(args[0]) : fromBase(args[0], from, name);
    if (to === 10) return n;
    return toBase(n, to, args.length > 1 ? args[1] : undefined, name);
  });

function bits48(x: number, name: string): number {
  if (x < 0 || x >= 2 ** 48 || x !== Math.trunc(x)) throw err("#NUM!", `${name} takes whole numbers from 0 to 2^48 - 1`);
  return x;
}

function bitwise(a: number, b: number, op: (x: number, y: number) => number): number {
  const hi = op(Math.floor(a / 2 ** 24), Math.floor(b / 2 ** 24));
  const lo = op(a % 2 ** 24, b % 2 ** 24);
  return hi * 2 ** 24 + lo;
}

export const ENGINEERING: Defs = {
  BIN2DEC: conv(2, 10, "BIN2DEC"),
  BIN2HEX: conv(2, 16, "BIN2HEX"),
  BIN2OCT: conv(2, 8, "BIN2OCT"),
  BITAND: numeric(2, 2, ([a, b]) => bitwise(bits48(a, "BITAND"), bits48(b, "BITAND"), (x, y) => x & y)),
  BITLSHIFT: numeric(2, 2, ([a, s]) => {
    bits48(a, "BITLSHIFT");
    if (Math.abs(s) > 53) return err("#NUM!", "BITLSHIFT: shift_amount up to 53");
    const r = s >= 0 ? a * 2 ** Math.trunc(s) : Math.floor(a / 2 ** -Math.trunc(s));
    return r >= 2 ** 48 ? err("#NUM!", "BITLSHIFT: the result is beyond 2^48 - 1") : r;
  }),
  BITOR: numeric(2, 2, ([a, b]) => bitwise(bits48(a, "BITOR"), bits48(b, "BITOR"), (x, y) => x | y)),
  BITRSHIFT: numeric(2, 2, ([a, s]) => {
    bits48(a, "BITRSHIFT");
    if (Math.abs(s) > 53) return err("#NUM!", "BITRSHIFT: shift_amount up to 53");
    const r = s >= 0 ? Math.floor(a / 2 ** Math.trunc(s)) : a * 2 ** -Math.trunc(s);
    return r >= 2 ** 48 ? err("#NUM!", "BITRSHIFT: the result is beyond 2^48 - 1") : r;
  }),
  BITXOR: numeric(2, 2, ([a, b]) => bitwise(bits48(a, "BITXOR"), bits48(b, "BITXOR"), (x, y) => x ^ y)),
  CONVERT: def(3, 3, "s", (args) => convertUnits(num(args[0]), text(args[1]), text(args[2]))),
  DEC2BIN: conv(10, 2, "DEC2BIN"),
  DEC2HEX: conv(10, 16, "DEC2HEX"),
  DEC2OCT: conv(10, 8, "DEC2OCT"),
  DELTA: numeric(1, 2, ([a, b]) => (a === b ? 1 : 0)),
  ERF: def(1, 2, "s", (args) => {
    const lo = num(args[0]);
    if (args.length < 2 || args[1] === null) return erf(lo);
    return erf(num(args[1])) - erf(lo);
  }),
  "ERF.PRECISE": numeric(1, 1, ([x]) => erf(x)),
  ERFC: numeric(1, 1, ([x]) => erfc(x)),
  "ERFC.PRECISE": numeric(1, 1, ([x]) => erfc(x)),
  GESTEP: numeric(1, 2, ([n, step]) => (n >= step ? 1 : 0)),
  HEX2BIN: conv(16, 2, "HEX2BIN"),
  HEX2DEC: conv(16, 10, "HEX2DEC"),
  HEX2OCT: conv(16, 8, "HEX2OCT"),
  OCT2BIN: conv(8, 2, "OCT2BIN"),
  OCT2DEC: conv(8, 10, "OCT2DEC"),
  OCT2HEX: conv(8, 16, "OCT2HEX"),
};

