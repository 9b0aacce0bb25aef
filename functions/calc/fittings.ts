/**
 * Loss coefficients of fittings and valves. Valves and bends: the equivalent-length method,
 * K = f_T·(L/D), with f_T the fully turbulent friction factor of clean commercial steel pipe of
 * the given inside diameter (Colebrook's rough-pipe limit, ε = 0.045 mm). Entrances and exits:
 * fixed K. L/D and K values as tabulated in Crane Technical Paper 410 (from memory).
 */
import { CalcError, type CalcResult, ok, requirePositive, step } from "./_lib/result";

const STEEL_ROUGHNESS = 0.045e-3;

/** Fitting name → L/D (equivalent length in diameters) or a fixed K. */
export const FITTINGS: Record<string, { ld?: number; k?: number; note: string }> = {
  "elbow 90": { ld: 30, note: "standard 90° threaded or welded elbow" },
  "elbow 90 long": { ld: 20, note: "long-radius 90° elbow (r/D = 1.5)" },
  "elbow 45": { ld: 16, note: "standard 45° elbow" },
  "bend 180": { ld: 50, note: "close-return bend" },
  "tee run": { ld: 20, note: "tee, flow through the run" },
  "tee branch": { ld: 60, note: "tee, flow through the branch" },
  "gate valve": { ld: 8, note: "gate valve, fully open" },
  "ball valve": { ld: 3, note: "full-port ball valve, fully open" },
  "plug valve": { ld: 18, note: "plug valve, straight-through, fully open" },
  "butterfly valve": { ld: 45, note: "butterfly valve, fully open (NPS 2 to 8; larger sizes less)" },
  "globe valve": { ld: 340, note: "globe valve, fully open" },
  "angle valve": { ld: 150, note: "angle valve, fully open" },
  "swing check": { ld: 100, note: "swing check valve, fully open" },
  "lift check": { ld: 600, note: "lift check valve, fully open" },
  "foot valve": { ld: 420, note: "foot valve with strainer, poppet disc" },
  "entrance sharp": { k: 0.5, note: "square-edged entrance from a tank" },
  "entrance projecting": { k: 0.78, note: "inward-projecting (re-entrant) entrance" },
  "entrance rounded": { k: 0.04, note: "well-rounded entrance (r/D ≥ 0.15)" },
  exit: { k: 1, note: "exit into a tank (all velocity head lost)" },
};

/** Fully turbulent (rough-pipe) Darcy friction factor: 1/√f = −2·log10(ε/(3.7·D)). */
export function fullyTurbulentFriction(diameter: number, roughness = STEEL_ROUGHNESS): number {
  const x = -2 * Math.log10(roughness / (3.7 * diameter));
  return 1 / (x * x);
}

export function fittingK(fitting: string, diameter: number): CalcResult {
  const key = fitting.trim().toLowerCase().replace(/[-_°]+/g, " ").replace(/\s+/g, " ").trim();
  // Own entries only: text such as "constructor" must not find Object's properties.
  const entry = Object.hasOwn(FITTINGS, key) ? FITTINGS[key] : undefined;
  if (!entry) {
    throw new CalcError("fitting", `unknown fitting "${fitting}": expected one of ${Object.keys(FITTINGS).map((k) => `"${k}"`).join(", ")}`, "value");
  }
  if (entry.k !== undefined) return ok(entry.k, [], [step("K", entry.note, entry.k, "ratio", "fixed K (Crane TP-410)")]);
  requirePositive("diameter", diameter, "an inside diameter greater than zero");
  const fT = fullyTurbulentFriction(diameter);
  return ok(fT * entry.ld!, [], [
    step("ε/D", "relative roughness of clean commercial steel", STEEL_ROUGHNESS / diameter, "ratio", "ε = 0.045 mm"),
    step("f_T", "fully turbulent friction factor", fT, "ratio", "1/√f_T = −2·log10(ε/(3.7·D)), Colebrook's rough-pipe limit"),
    step("L/D", `equivalent length in diameters: ${entry.note}`, entry.ld!, "ratio", "Crane TP-410 (from memory)"),
  ]);
}
