/** A1-style cell addresses (no dependencies, shared by the headless command and the pane). */

export function cellKey(row: number, col: number): string {
  return `${row}:${col}`;
}

/** 1 → "A", 28 → "AB". */
export function columnLetters(col: number): string {
  let s = "";
  for (let n = col; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
  return s;
}

/** "AB" → 28 ("$" and case ignored). */
export function columnNumber(letters: string): number {
  return [...letters.replace(/\$/g, "").toUpperCase()].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0);
}

export function addressOf(row: number, col: number): string {
  return `${columnLetters(col)}${row}`;
}

/** Parses "B12" into row and column numbers (1-based). */
export function parseAddress(address: string): { row: number; col: number } {
  const m = /^\$?([A-Za-z]{1,3})\$?(\d+)$/.exec(address.trim());
  if (!m) throw new Error(`not a cell address: ${address}`);
  let col = 0;
  for (const ch of m[1].toUpperCase()) col = col * 26 + (ch.charCodeAt(0) - 64);
  return { row: Number(m[2]), col };
}

/** "Inputs!" or "'Pump data'!" ('' for a quote in the name), as a formula writes a sheet. */
export function sheetPrefix(sheet: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) ? `${sheet}!` : `'${sheet.replace(/'/g, "''")}'!`;
}

/** Splits "Inputs!B4" or "'A!B'!B4" into sheet and address; a bare address is on `here`. */
export function splitReference(ref: string, here: string): { sheet: string; address: string } {
  const bang = ref.lastIndexOf("!");
  if (bang < 0) return { sheet: here, address: ref };
  const sheet = ref.slice(0, bang);
  return { sheet: sheet.startsWith("'") && sheet.endsWith("'") ? sheet.slice(1, -1).replace(/''/g, "'") : sheet, address: ref.slice(bang + 1) };
}
