/**
 * Writes a workbook the way Excel saves one that uses Nappe, so that Excel resolves the calls
 * when the add-in loads (a formula stored as `NAPPE.X(...)` stays #NAME? in Excel):
 *
 * - every NAPPE call as `_xldudf_NAPPE_X_Y(...)` in a single-cell dynamic-array formula
 *   (`<c cm="1"><f t="array" ref="B21">`), its cached value kept, spilled results keeping
 *   their range;
 * - `xl/metadata.xml` with the dynamic-array cell metadata (XLDAPR, fDynamic="1");
 * - the web-extension parts [MS-OWEXML] naming the add-in by its manifest Id (store
 *   "developer", as for a sideloaded add-in) with the list of custom-function ids used, and a
 *   task pane entry, with their relationships and content types.
 *
 * Works on the bytes exceljs writes; the text of everything else is left as it was.
 */
import JSZip from "jszip";
import { unescapeXml } from "./xml";
import { hasNappeCall, storedFormula, storedIds } from "./storedForm";

/** The add-in as its manifest names it (manifest/manifest.xml; a test keeps the two equal). */
export const ADDIN = { id: "bd6d8687-d70e-4385-9215-de6b83b7d8cd", version: "0.1.0.0" };

const NS_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main";
const NS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships";
const NS_PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships";
export const REL = {
  sheetMetadata: `${NS_REL}/sheetMetadata`,
  taskpanes: "http://schemas.microsoft.com/office/2011/relationships/webextensiontaskpanes",
  webextension: "http://schemas.microsoft.com/office/2011/relationships/webextension",
};
export const CONTENT_TYPE = {
  metadata: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheetMetadata+xml",
  webextension: "application/vnd.ms-office.webextension+xml",
  taskpanes: "application/vnd.ms-office.webextensiontaskpanes+xml",
};
/**
 * Extension URIs: the dynamic-array properties of ECMA-376's metadata, and the list of an add-in's
 * custom function ids as desktop Excel writes it in a web-extension part ([MS-OWEXML]; seen in a
 * workbook Excel saved with an add-in's custom functions).
 */
const EXT_DYNAMIC_ARRAY = "{bdbb8cdc-fa1e-496e-a857-3c3f30c029c3}";
const EXT_FUNCTION_IDS = "{7C84B067-C214-45C3-A712-C9D94CD141B2}";

function escapeXml(text: string): string {
  return text.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);
}

const METADATA = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<metadata xmlns="${NS_MAIN}" xmlns:xda="http://schemas.microsoft.com/office/spreadsheetml/2017/dynamicarray"><metadataTypes count="1"><metadataType name="XLDAPR" minSupportedVersion="120000" copy="1" pasteAll="1" pasteValues="1" merge="1" splitFirst="1" rowColShift="1" clearFormats="1" clearComments="1" assign="1" coerce="1" cellMeta="1"/></metadataTypes><futureMetadata name="XLDAPR" count="1"><bk><extLst><ext uri="${EXT_DYNAMIC_ARRAY}"><xda:dynamicArrayProperties fDynamic="1" fCollapsed="0"/></ext></extLst></bk></futureMetadata><cellMetadata count="1"><bk><rc t="1" v="0"/></bk></cellMetadata></metadata>`;

/**
 * The custom function ids a web-extension part records: Excel's `customFunctionIds` elements, one
 * per function, and the `customFunctionId` elements earlier versions of Nappe wrote.
 */
export function recordedFunctionIds(xml: string): string[] {
  return [...xml.matchAll(/<(?:\w+:)?customFunctionIds?>([^<]*)<\/(?:\w+:)?customFunctionIds?>/g)].map((m) => unescapeXml(m[1]));
}

function webExtension(ids: readonly string[]): string {
  const list = ids.map((id) => `<we:customFunctionIds>${escapeXml(id)}</we:customFunctionIds>`).join("");
  return `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<we:webextension xmlns:we="http://schemas.microsoft.com/office/webextensions/webextension/2010/11" id="{${ADDIN.id.toUpperCase()}}"><we:reference id="${ADDIN.id}" version="${ADDIN.version}" store="developer" storeType="Registry"/><we:alternateReferences/><we:properties/><we:bindings/><we:snapshot xmlns:r="${NS_REL}"/><we:extLst><a:ext xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main" uri="${EXT_FUNCTION_IDS}"><we:customFunctionIdList>${list}</we:customFunctionIdList></a:ext></we:extLst></we:webextension>`;
}

const TASKPANES = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<wetp:taskpanes xmlns:wetp="http://schemas.microsoft.com/office/webextensions/taskpanes/2010/11"><wetp:taskpane dockstate="right" visibility="0" width="350" row="0"><wetp:webextensionref xmlns:r="${NS_REL}" r:id="rId1"/></wetp:taskpane></wetp:taskpanes>`;

function addRelationship(xml: string | undefined, type: string, target: string): string {
  const base = xml ?? `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${NS_PKG_REL}"></Relationships>`;
  if (base.includes(`Type="${type}"`)) return base;
  const used = new Set([...base.matchAll(/Id="rId(\d+)"/g)].map((m) => Number(m[1])));
  let n = 1;
  while (used.has(n)) n++;
  return base.replace("</Relationships>", `<Relationship Id="rId${n}" Type="${type}" Target="${target}"/></Relationships>`);
}

function addOverride(xml: string, part: string, type: string): string {
  if (xml.includes(`PartName="${part}"`)) return xml;
  return xml.replace("</Types>", `<Override PartName="${part}" ContentType="${type}"/></Types>`);
}

/** Rewrites one sheet's cells: NAPPE calls in the stored form, as dynamic-array formulas. */
function rewriteSheet(xml: string, ids: Set<string>): string {
  return xml.replace(/<c\b([^>]*?)(?<!\/)>([\s\S]*?)<\/c>/g, (whole, attrs: string, inner: string) => {
    const f = /<f\b([^>]*)>([\s\S]*?)<\/f>/.exec(inner);
    if (!f) return whole;
    const formula = unescapeXml(f[2]);
    if (!hasNappeCall(formula)) return whole;
    for (const id of storedIds(formula)) ids.add(id);
    const ref = /\sref="([^"]*)"/.exec(f[1])?.[1] ?? /\sr="([^"]*)"/.exec(attrs)?.[1];
    const fAttrs = / t="shared"/.test(f[1]) ? f[1] : ` t="array" ref="${ref}"`;
    const cellAttrs = /\scm="/.test(attrs) ? attrs : `${attrs} cm="1"`;
    return `<c${cellAttrs}>${inner.replace(f[0], `<f${fAttrs}>${escapeXml(storedFormula(formula))}</f>`)}</c>`;
  });
}

/** The workbook in Excel's stored form, from bytes exceljs wrote. Returns the ids of the functions used too. */
export async function excelStoredForm(bytes: Buffer | ArrayBuffer): Promise<{ bytes: Buffer; functionIds: string[] }> {
  const zip = await JSZip.loadAsync(bytes);
  const ids = new Set<string>();
  for (const path of Object.keys(zip.files)) {
    if (!/^xl\/worksheets\/[^/]+\.xml$/.test(path)) continue;
    const xml = await zip.file(path)!.async("string");
    zip.file(path, rewriteSheet(xml, ids));
  }
  // Functions a web-extension part already records (written by Excel, or in an earlier form) are kept.
  const existing = zip.file("xl/webextensions/webextension1.xml");
  if (ids.size && existing) for (const id of recordedFunctionIds(await existing.async("string"))) ids.add(id);
  const functionIds = [...ids].sort();
  if (functionIds.length) {
    zip.file("xl/metadata.xml", METADATA);
    zip.file("xl/_rels/workbook.xml.rels", addRelationship(await zip.file("xl/_rels/workbook.xml.rels")?.async("string"), REL.sheetMetadata, "metadata.xml"));
    zip.file("xl/webextensions/webextension1.xml", webExtension(functionIds));
    zip.file("xl/webextensions/taskpanes.xml", TASKPANES);
    zip.file("xl/webextensions/_rels/taskpanes.xml.rels", addRelationship(undefined, REL.webextension, "webextension1.xml"));
    zip.file("_rels/.rels", addRelationship(await zip.file("_rels/.rels")?.async("string"), REL.taskpanes, "xl/webextensions/taskpanes.xml"));
    let types = await zip.file("[Content_Types].xml")!.async("string");
    types = addOverride(types, "/xl/metadata.xml", CONTENT_TYPE.metadata);
    types = addOverride(types, "/xl/webextensions/webextension1.xml", CONTENT_TYPE.webextension);
    types = addOverride(types, "/xl/webextensions/taskpanes.xml", CONTENT_TYPE.taskpanes);
    zip.file("[Content_Types].xml", types);
  }
  const out = await zip.generateAsync({ type: "nodebuffer", compression: "DEFLATE", compressionOptions: { level: 6 } });
  return { bytes: out, functionIds };
}
