import { spawn } from "node:child_process";
import { chromium } from "playwright-core";
const server = spawn(process.execPath, ["--import", "tsx", "scripts/preview.ts", "--port", "0"], { stdio: ["ignore", "pipe", "inherit"] });
const url = await new Promise((res) => { let o = ""; server.stdout.on("data", (d) => { o += d; const m = /(http:\/\/127\.0\.0\.1:\d+\/preview\.html)/.exec(o); if (m) res(m[1]); }); });
const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: ["--headless", "--no-sandbox", "--disable-gpu"] });
const width = Number(process.argv[2] ?? 350);
const page = await browser.newPage({ viewport: { width: 900, height: Number(process.env.H ?? 800) } });
page.on("pageerror", (e) => console.log("PAGEERROR", e));
await page.goto(`${url}?pane=${width}`);
await page.locator("table.grid").waitFor();
async function sel(sheet, addr) { await page.getByRole("button", { name: sheet, exact: true }).click(); await page.locator(`td[data-address="${addr}"]`).click(); await page.locator(".cell-address", { hasText: `${sheet}!${addr}` }).waitFor(); }
const app = page.locator("#app");
for (const [sheet, addr] of (process.argv[3] ?? "Calc:B9,Calc:J3,Calc:B21").split(",").map((x) => x.split(":"))) {
  await sel(sheet, addr);
  await page.waitForTimeout(300);
  await app.screenshot({ path: `/tmp/shots/${width}-${sheet}-${addr}.png` });
  const over = await page.evaluate(() => { const a = document.getElementById("app"); const b = document.querySelector(".pane-body"); return { app: [a.scrollWidth, a.clientWidth], body: [b.scrollWidth, b.clientWidth] }; });
  console.log(sheet, addr, JSON.stringify(over));
}
await page.getByRole("tab", { name: "Guide" }).click();
await page.getByRole("searchbox", { name: "Search the functions" }).fill("viscosity");
await page.getByRole("button", { name: "NAPPE.REYNOLDS", exact: true }).click().catch(() => {});
await page.waitForTimeout(300);
await app.screenshot({ path: `/tmp/shots/${width}-guide.png` });
await page.getByRole("tab", { name: "Workbook" }).click();
await page.getByRole("button", { name: "Check the whole workbook" }).click();
await page.waitForTimeout(3000);
await app.screenshot({ path: `/tmp/shots/${width}-workbook.png` });
await browser.close(); server.kill();
