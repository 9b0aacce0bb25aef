/**
 * Offline checks of the add-in-only manifest. The official validator (office-addin-manifest
 * validate) sends the manifest to an online service, which this project's machines cannot reach;
 * these tests check what can be checked without it (see DEVELOPERS.md).
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { OfficeAddinManifest } from "office-addin-manifest";
import { describe, expect, it } from "vitest";

const root = join(__dirname, "..");
const xml = readFileSync(join(root, "manifest/manifest.xml"), "utf8");
const ordered = new XMLParser({ preserveOrder: true, ignoreAttributes: false, attributeNamePrefix: "@" }).parse(xml) as Record<string, unknown>[];
const officeApp = (ordered.find((n) => "OfficeApp" in n)!.OfficeApp as Record<string, unknown>[]).map((n) => Object.keys(n).find((k) => k !== ":@")!);

describe("manifest", () => {
  it("is well-formed XML", () => {
    expect(XMLValidator.validate(xml)).toBe(true);
  });
  it("is read by the official manifest reader (office-addin-manifest)", async () => {
    const info = await OfficeAddinManifest.readManifestFile(join(root, "manifest/manifest.xml"));
    expect(info.displayName).toBe("Nappe");
    expect(info.hosts).toEqual(["Workbook"]);
    expect(info.id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(info.version).toMatch(/^\d+\.\d+\.\d+\.\d+$/);
    expect(info.permissions).toBe("ReadWriteDocument");
  });
  it("orders OfficeApp's children as the TaskPaneApp schema sequence requires (Office add-in manifest reference)", () => {
    const sequence = ["Id", "Version", "ProviderName", "DefaultLocale", "DisplayName", "Description", "IconUrl", "HighResolutionIconUrl", "SupportUrl", "AppDomains", "Hosts", "Requirements", "DefaultSettings", "Permissions", "VersionOverrides"];
    const present = officeApp.filter((k) => !k.startsWith("#"));
    expect(present).toEqual(sequence.filter((k) => present.includes(k)));
  });
  it("resolves every resid to a resource, with ids of at most 32 characters", () => {
    const defined = [...xml.matchAll(/<bt:(?:Image|Url|String) id="([^"]+)"/g)].map((m) => m[1]);
    const used = [...xml.matchAll(/resid="([^"]+)"/g)].map((m) => m[1]);
    for (const r of used) expect(defined, r).toContain(r);
    for (const id of defined) expect(id.length, id).toBeLessThanOrEqual(32);
  });
  it("keeps short strings within 125 characters and long strings within 250", () => {
    const section = (name: string) => xml.slice(xml.indexOf(`<bt:${name}>`), xml.indexOf(`</bt:${name}>`));
    for (const m of section("ShortStrings").matchAll(/DefaultValue="([^"]*)"/g)) expect(m[1].length).toBeLessThanOrEqual(125);
    for (const m of section("LongStrings").matchAll(/DefaultValue="([^"]*)"/g)) expect(m[1].length).toBeLessThanOrEqual(250);
  });
  it("declares the NAPPE namespace, the custom-functions runtime and https URLs only", () => {
    expect(xml).toMatch(/<bt:String id="Functions.Namespace" DefaultValue="NAPPE"\/>/);
    expect(xml).toMatch(/<Set Name="CustomFunctionsRuntime" MinVersion="1.1"\/>/);
    for (const m of xml.matchAll(/DefaultValue="(\w+:\/\/[^"]+)"/g)) expect(m[1]).toMatch(/^https:\/\//);
  });
  it("points only at files the build produces", () => {
    const files = [...xml.matchAll(/https:\/\/localhost:3000\/([^"]+)"/g)].map((m) => m[1]);
    expect(files.length).toBeGreaterThan(5);
    for (const f of new Set(files)) expect(existsSync(join(root, "dist", f)), f).toBe(true);
  });
});
