/**
 * Reading a zip package's parts (PKWARE APPNOTE 6.3: the end-of-central-directory record, the
 * central directory and each local header), inflated by Node's own zlib. An .xlsx is a zip of
 * stored or deflated parts; this reads only what the workbook reader needs, quickly and without a
 * JavaScript inflater. Writing a package (the hand-off copy) is left to JSZip.
 */
import { inflateRawSync } from "node:zlib";

/** A part of the package, as its central directory entry describes it. */
interface ZipEntry {
  name: string;
  /** 0 stored, 8 deflated. */
  method: number;
  compressedSize: number;
  uncompressedSize: number;
  localHeaderOffset: number;
}

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;
const LOCAL = 0x04034b50;

export class ZipReader {
  readonly entries = new Map<string, ZipEntry>();

  constructor(private readonly bytes: Buffer) {
    // The end record is in the last 22 + 65 535 bytes (its comment is at most 65 535 long).
    let end = -1;
    for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 0xffff); i--) {
      if (bytes.readUInt32LE(i) === EOCD) {
        end = i;
        break;
      }
    }
    if (end < 0) throw new Error("no end-of-central-directory record");
    const count = bytes.readUInt16LE(end + 10);
    const size = bytes.readUInt32LE(end + 12);
    let at = bytes.readUInt32LE(end + 16);
    if (count === 0xffff || size === 0xffffffff || at === 0xffffffff) throw new Error("a Zip64 package (over 4 GB or 65 535 parts) is not supported");
    for (let i = 0; i < count; i++) {
      if (at + 46 > bytes.length || bytes.readUInt32LE(at) !== CENTRAL) throw new Error("the central directory is damaged");
      const flags = bytes.readUInt16LE(at + 8);
      const nameLength = bytes.readUInt16LE(at + 28);
      const extraLength = bytes.readUInt16LE(at + 30);
      const commentLength = bytes.readUInt16LE(at + 32);
      const name = bytes.toString(flags & 0x800 ? "utf8" : "latin1", at + 46, at + 46 + nameLength);
      if (flags & 1) throw new Error(`part ${name} is encrypted`);
      this.entries.set(name, {
        name,
        method: bytes.readUInt16LE(at + 10),
        compressedSize: bytes.readUInt32LE(at + 20),
        uncompressedSize: bytes.readUInt32LE(at + 24),
        localHeaderOffset: bytes.readUInt32LE(at + 42),
      });
      at += 46 + nameLength + extraLength + commentLength;
    }
  }

  /** The bytes of a part, or undefined when the package has no such part. */
  read(name: string): Buffer | undefined {
    const e = this.entries.get(name);
    if (!e) return undefined;
    const h = e.localHeaderOffset;
    if (h + 30 > this.bytes.length || this.bytes.readUInt32LE(h) !== LOCAL) throw new Error(`the local header of ${name} is damaged`);
    const start = h + 30 + this.bytes.readUInt16LE(h + 26) + this.bytes.readUInt16LE(h + 28);
    const data = this.bytes.subarray(start, start + e.compressedSize);
    if (e.method === 0) return data;
    if (e.method === 8) return inflateRawSync(data);
    throw new Error(`part ${name} uses compression method ${e.method}, which is not supported`);
  }

  /** A part as UTF-8 text (a byte-order mark dropped), or undefined when there is no such part. */
  text(name: string): string | undefined {
    const b = this.read(name);
    if (!b) return undefined;
    const text = b.toString("utf8");
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  }
}
