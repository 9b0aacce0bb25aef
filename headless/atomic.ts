/** Writing reports and copies so that a reader never sees half a file, and saying plainly when a path cannot be written. */
import { constants } from "node:fs";
import { access, mkdir, rename, stat, writeFile } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";

/** An output path that cannot be written, with the reason in words. */
export class UnwritableError extends Error {}

/** The folders from the nearest existing one down to the file's own (those missing, in order to create). */
async function missingFolders(path: string): Promise<{ existing: string; missing: string[] }> {
  const missing: string[] = [];
  let dir = dirname(resolve(path));
  for (;;) {
    try {
      const info = await stat(dir);
      if (!info.isDirectory()) throw new UnwritableError(`cannot write ${path}: ${dir} is a file, not a folder`);
      return { existing: dir, missing: missing.reverse() };
    } catch (e) {
      if (e instanceof UnwritableError) throw e;
      const parent = dirname(dir);
      if (parent === dir) throw new UnwritableError(`cannot write ${path}: no folder of it exists`);
      missing.push(dir);
      dir = parent;
    }
  }
}

/** Checks, before any work, that `path` can be written: its folder exists or can be made, and is writable; the path is not a folder. */
export async function checkWritable(path: string): Promise<void> {
  const { existing } = await missingFolders(path);
  try {
    await access(existing, constants.W_OK);
  } catch {
    throw new UnwritableError(`cannot write ${path}: no permission to write in ${existing}`);
  }
  try {
    if ((await stat(path)).isDirectory()) throw new UnwritableError(`cannot write ${path}: it is a folder`);
  } catch (e) {
    if (e instanceof UnwritableError) throw e;
  }
}

/**
 * Writes a file atomically: a temporary file beside it, then a rename. Missing folders are made
 * one at a time (a recursive make spins forever under some special file systems, such as /proc).
 */
export async function writeAtomically(path: string, data: string | Buffer): Promise<void> {
  const { missing } = await missingFolders(path);
  for (const dir of missing) {
    try {
      await mkdir(dir);
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw new UnwritableError(`cannot write ${path}: cannot make the folder ${dir} (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
    }
  }
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    await writeFile(tmp, data);
  } catch (e) {
    throw new UnwritableError(`cannot write ${path} (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  await rename(tmp, path);
}
