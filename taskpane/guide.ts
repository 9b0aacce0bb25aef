/** The function guide's pure logic: search the catalogue, describe a function for people. */
import type { FunctionSpec } from "../functions/catalog/types";
import { DIMENSIONS } from "../functions/units/dimensions";

/** Functions whose id, purpose or parameter names contain every word of the query. */
export function searchCatalog(catalog: readonly FunctionSpec[], query: string): FunctionSpec[] {
  const words = query.toLowerCase().split(/\s+/).filter(Boolean);
  if (!words.length) return [...catalog];
  return catalog.filter((s) => {
    const hay = [s.id, s.purpose, ...s.params.map((p) => p.name), ...s.sources].join(" ").toLowerCase();
    return words.every((w) => hay.includes(w));
  });
}

/** The worksheet signature, optional arguments in brackets. */
export function signature(spec: FunctionSpec): string {
  return `NAPPE.${spec.id}(${spec.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(", ")})`;
}

/** One line per argument: name, how a bare number is read, meaning. */
export function describeArguments(spec: FunctionSpec): { name: string; reads: string; meaning: string }[] {
  return spec.params.map((p) => {
    let reads: string;
    if (p.kind === "quantity") reads = p.dim === "efficiency" ? 'fraction or "78%"' : `bare number in ${DIMENSIONS[p.dim].baseLabel}, or text with a unit`;
    else if (p.kind === "choice") reads = p.options.join(" | ");
    else if (p.kind === "unit") reads = "unit name";
    else if (p.kind === "text") reads = "name or number";
    else if (p.kind === "table") reads = `range: ${p.table} table, header row with units optional`;
    else reads = "number or text with a unit";
    const note = "defaultNote" in p && p.defaultNote ? ` Default: ${p.defaultNote}.` : "";
    return { name: p.optional ? `${p.name} (optional)` : p.name, reads, meaning: p.description + note };
  });
}

export { exampleFormula } from "../functions/catalog/_formula";
