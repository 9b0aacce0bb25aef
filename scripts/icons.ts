/**
 * Draws the add-in's icons (original artwork): a sheet of water springing off a weir crest,
 * white on deep teal. Writes manifest/assets/icon-<size>.png. Run: npx tsx scripts/icons.ts
 */
import { writeFileSync } from "node:fs";
import { deflateSync } from "node:zlib";

const TEAL = [14, 84, 99];
const WHITE = [255, 255, 255];
const CREST = [150, 205, 214];

function crc32(buf: Buffer): number {
  let c = ~0;
  for (const b of buf) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return ~c >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}

/** Colour at a point of the unit square (x right, y down), or null outside the rounded tile. */
function shade(x: number, y: number): number[] | null {
  const r = 0.18;
  const cx = Math.min(Math.max(x, r), 1 - r);
  const cy = Math.min(Math.max(y, r), 1 - r);
  if ((x - cx) ** 2 + (y - cy) ** 2 > r * r) return null;
  // Weir crest: a block at the left, top at y = 0.42.
  if (x < 0.36 && y > 0.42 && y < 0.86) return CREST;
  // The nappe: between an upper and a lower trajectory leaving the crest at x = 0.36.
  if (x >= 0.12) {
    const s = Math.max(x - 0.36, 0);
    const upper = 0.2 + 2.1 * s * s;
    const lower = 0.42 + 2.9 * s * s;
    if (y >= upper && y <= lower && x < 0.86) return WHITE;
  }
  return TEAL;
}

function icon(size: number): Buffer {
  const ss = 4;
  const rows: Buffer[] = [];
  for (let py = 0; py < size; py++) {
    const row = Buffer.alloc(1 + size * 4);
    for (let px = 0; px < size; px++) {
      let r = 0, g = 0, b = 0, a = 0;
      for (let sy = 0; sy < ss; sy++) {
        for (let sx = 0; sx < ss; sx++) {
          const c = shade((px + (sx + 0.5) / ss) / size, (py + (sy + 0.5) / ss) / size);
          if (c) { r += c[0]; g += c[1]; b += c[2]; a++; }
        }
      }
      const o = 1 + px * 4;
      if (a) { row[o] = r / a; row[o + 1] = g / a; row[o + 2] = b / a; }
      row[o + 3] = Math.round((255 * a) / (ss * ss));
    }
    rows.push(row);
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // RGBA
  const sig = Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]);
  return Buffer.concat([sig, chunk("IHDR", ihdr), chunk("IDAT", deflateSync(Buffer.concat(rows))), chunk("IEND", Buffer.alloc(0))]);
}

for (const size of [16, 32, 64, 80, 128]) writeFileSync(`manifest/assets/icon-${size}.png`, icon(size));
console.log("Icons written to manifest/assets/.");
