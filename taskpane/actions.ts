/** Pane actions that write to the workbook (fix, insert): pure, so their failure handling is tested in Node. */

/**
 * Runs an action that writes to the workbook. A failure (a protected sheet, a cell being
 * edited, a lost connection) is said in the pane's status line, never swallowed.
 */
export async function writeAction(ctx: { say(text: string): void }, what: string, action: () => Promise<void>): Promise<void> {
  try {
    await action();
  } catch (e) {
    ctx.say(`Could not ${what}: ${e instanceof Error ? e.message : String(e)}`);
  }
}
