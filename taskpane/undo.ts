/**
 * Undo for the pane's writes (fix, fix all, relabel, insert, keep a check): before each write the
 * pane remembers what the cells held, and "Undo" puts it back. Pure over the HostPort, so it is
 * tested in Node. Excel's own undo does not cover writes made by an add-in, hence this.
 */
import type { HostPort } from "./host/port";

interface Held {
  sheet: string;
  address: string;
  /** Formula without "=", when the cell held one. */
  formula?: string;
  /** The constant it held, "" when it was empty. */
  value: string | number | boolean;
}

interface Change {
  /** What was done, for the button and the status line ("insert NAPPE.HEADLOSS into Calc!B7"). */
  what: string;
  before: Held[];
}

/** The cells' contents now, to put back later. */
async function hold(port: HostPort, cells: readonly { sheet: string; address: string }[]): Promise<Held[]> {
  const out: Held[] = [];
  for (const c of cells) {
    const now = await port.cell(c.sheet, c.address);
    const at = { sheet: c.sheet, address: c.address };
    out.push(now.formula ? { ...at, formula: now.formula, value: "" } : { ...at, value: now.value ?? "" });
  }
  return out;
}

export class UndoStack {
  private readonly changes: Change[] = [];
  private readonly listeners: (() => void)[] = [];

  constructor(private readonly port: HostPort, private readonly limit = 20) {}

  /** Remembers the cells, then runs the write; the change is kept only when the write succeeds. */
  async write(what: string, cells: readonly { sheet: string; address: string }[], action: () => Promise<void>): Promise<void> {
    const before = await hold(this.port, cells);
    await action();
    this.changes.push({ what, before });
    if (this.changes.length > this.limit) this.changes.shift();
    this.notify();
  }

  /** What "Undo" would undo, or undefined. */
  get last(): string | undefined {
    return this.changes[this.changes.length - 1]?.what;
  }

  /** Puts back the cells of the last change (last written first); returns what was undone. */
  async undo(): Promise<string | undefined> {
    const change = this.changes.pop();
    if (!change) return undefined;
    try {
      for (const h of [...change.before].reverse()) {
        if (h.formula !== undefined) await this.port.setFormula(h.sheet, h.address, h.formula);
        else await this.port.setValue(h.sheet, h.address, typeof h.value === "boolean" ? String(h.value).toUpperCase() : h.value);
      }
    } finally {
      this.notify();
    }
    return change.what;
  }

  onChange(listener: () => void): void {
    this.listeners.push(listener);
  }

  private notify(): void {
    for (const l of this.listeners) l();
  }
}
