/** npm run stop: removes the sideloaded add-in from desktop Excel (Windows, macOS). */
import { join } from "node:path";
import { devSettings } from "./start";

const MANIFEST = join(import.meta.dirname, "..", "dist", "manifest.xml");

if (process.platform === "win32" || process.platform === "darwin") {
  try {
    const { unregisterAddIn } = await devSettings();
    await unregisterAddIn(MANIFEST);
    console.log("Removed the sideloaded Nappe add-in from desktop Excel.");
  } catch (e) {
    console.error(`Could not remove the add-in: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  }
} else {
  console.log("Nothing is sideloaded on this platform. In Excel on the web, remove Nappe from Home > Add-ins > My add-ins.");
}
