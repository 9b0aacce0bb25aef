/** Writing reports and copies so that a reader never sees half a file. */
import { mkdir, rename, writeFile } from "node:fs/promises";
import { basename, dirname, join } from "node:path";

/** Writes a file atomically: a temporary file beside it, then a rename. */
export async function writeAtomically(path: string, data: string | Buffer): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  await writeFile(tmp, data);
  await rename(tmp, path);
}
