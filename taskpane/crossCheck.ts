/**
 * The pane's cross-check of a hand formula: a thin adapter that reads the workbook once through
 * the HostPort (values as the host calculated them) and runs the pure cross-check and diagnosis
 * of workbook/crossCheck.ts, which every other view shares.
 */
import { crossCheckHand } from "../workbook/crossCheck";
import { formulaLibraryReady } from "../workbook/formulaLibrary";
import { getCell } from "../workbook/model";
import type { HostPort } from "./host/port";

/**
 * Cross-checks the hand formula at sheet!address as the quantity `specId` computes. `mapping`
 * points arguments at cells by hand (argument → "B7", "Inputs!B7") or gives a literal ("20 degC").
 */
export async function crossCheckCell(port: HostPort, sheet: string, address: string, specId: string, options: { tolerance?: number; mapping?: Record<string, string> } = {}): Promise<ReturnType<typeof crossCheckHand>> {
  await formulaLibraryReady();
  const wb = await port.workbookSnapshot();
  return crossCheckHand({ wb, value: (s, r, c) => getCell(wb, s, r, c)?.value ?? null }, sheet, address, specId, options);
}
