// Hostile files for the upload tests, built byte by byte: PNGs and JPEGs whose headers claim any
// size, a PNG whose pixel data inflates far past what its header says, ZIP and gzip bombs, and
// CSV text in encodings other than UTF-8.
import { syncBuiltinESMExports } from "node:module";
import zlib from "node:zlib";

function chunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, "latin1"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(body));
  return Buffer.concat([length, body, crc]);
}

const PNG_SIGNATURE = Buffer.from("89504e470d0a1a0a", "hex");

/**
 * A PNG (8-bit RGBA, so pdfkit would split its alpha channel, i.e. decode every pixel) whose IHDR
 * claims width × height. The pixel data is `rows` real rows of that width (default: as many as the
 * header claims, when that is small) deflated, or the given raw bytes.
 */
export function pngClaiming(width: number, height: number, { raw, colorType = 6 }: { raw?: Buffer; colorType?: number } = {}): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = colorType;
  const channels = colorType === 6 ? 4 : colorType === 2 ? 3 : colorType === 4 ? 2 : 1;
  const pixels = raw ?? Buffer.alloc(Math.min(height, 4) * (1 + width * channels));
  return Buffer.concat([PNG_SIGNATURE, chunk("IHDR", ihdr), chunk("IDAT", zlib.deflateSync(pixels, { level: 9 })), chunk("IEND", Buffer.alloc(0))]);
}

/** A valid w × h half-transparent RGBA PNG (every row present, filter "None"), for logos that must pass. */
export function pngOf(width: number, height: number): Buffer {
  const row = Buffer.concat([Buffer.from([0]), Buffer.alloc(width * 4, 0x80)]);
  return pngClaiming(width, height, { raw: Buffer.concat(Array.from({ length: height }, () => row)) });
}

/**
 * A baseline JPEG whose SOF0 claims width × height (no scan data: enough for any header reader,
 * and what a decoder would size its buffers from).
 */
export function jpegClaiming(width: number, height: number): Buffer {
  const app0 = Buffer.from("ffe000104a46494600010100000100010000", "hex");
  // A comment segment before the frame header, so a reader must walk the segments to find it.
  const text = Buffer.from("hostile comment\u0000", "latin1");
  const comment = Buffer.concat([Buffer.from([0xff, 0xfe, 0x00, text.length + 2]), text]);
  const sof = Buffer.from([0xff, 0xc0, 0x00, 0x11, 0x08, height >> 8, height & 0xff, width >> 8, width & 0xff, 0x03, 0x01, 0x22, 0x00, 0x02, 0x11, 0x01, 0x03, 0x11, 0x01]);
  return Buffer.concat([Buffer.from("ffd8", "hex"), app0, comment, sof, Buffer.from("ffd9", "hex")]);
}

/** Bytes of zeros that deflate to a few kilobytes per megabyte (deflate's best is about 1:1000). */
const zeros = (megabytes: number) => Buffer.alloc(megabytes * 1024 * 1024);

/**
 * A ZIP whose entries are deflated runs of zeros: `entries` × `megabytes` MB once inflated. The
 * first entry is "[Content_Types].xml", which a type sniffer opens to tell an Office file from a
 * plain ZIP; its header lies that it holds 1 KB, so a sniffer that trusts sizes inflates it.
 */
export function zipBomb(entries = 4, megabytes = 64): Buffer {
  const data = zlib.deflateRawSync(zeros(megabytes), { level: 9 });
  const crc = zlib.crc32(zeros(megabytes));
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (let i = 0; i < entries; i++) {
    const name = Buffer.from(i === 0 ? "[Content_Types].xml" : `word/part${i}.xml`, "latin1");
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0, 6);
    local.writeUInt16LE(8, 8); // deflate
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(data.length, 18);
    const declared = i === 0 ? 1024 : megabytes * 1024 * 1024;
    local.writeUInt32LE(declared, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(8, 10);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(data.length, 20);
    central.writeUInt32LE(declared, 24);
    central.writeUInt16LE(name.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, name, data);
    centrals.push(central, name);
    offset += local.length + name.length + data.length;
  }
  const directory = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries, 8);
  end.writeUInt16LE(entries, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, directory, end]);
}

/** gzip of `megabytes` MB of zeros (a tar-in-gzip sniffer inflates it to look inside). */
export function gzipBomb(megabytes = 256): Buffer {
  return zlib.gzipSync(zeros(megabytes), { level: 9 });
}

/** Text as UTF-16 little-endian with its byte-order mark, as Excel's "Unicode text" saves it. */
export function utf16le(text: string): Buffer {
  return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, "utf16le")]);
}

/** Text as UTF-16 big-endian with its byte-order mark. */
export function utf16be(text: string): Buffer {
  const le = Buffer.from(text, "utf16le");
  for (let i = 0; i + 1 < le.length; i += 2) [le[i], le[i + 1]] = [le[i + 1], le[i]];
  return Buffer.concat([Buffer.from([0xfe, 0xff]), le]);
}

/**
 * Counts every decompressor made while `run` runs in this process (the app under test runs in the
 * test's process): web DecompressionStream (what file-type and @tokenizer/inflate use) and zlib's
 * inflate/gunzip functions and streams. Each is wrapped and still does its work.
 */
export async function countDecompressions<T>(run: () => Promise<T>): Promise<{ result: T; count: number }> {
  let count = 0;
  const Original = globalThis.DecompressionStream;
  globalThis.DecompressionStream = class extends Original {
    constructor(format: CompressionFormat) {
      count++;
      super(format);
    }
  };
  const names = ["inflate", "inflateSync", "inflateRaw", "inflateRawSync", "gunzip", "gunzipSync", "unzip", "unzipSync", "brotliDecompress", "brotliDecompressSync", "createInflate", "createInflateRaw", "createGunzip", "createUnzip", "createBrotliDecompress"];
  const saved = names.map((name) => [name, Object.getOwnPropertyDescriptor(zlib, name)!] as const);
  for (const [name, descriptor] of saved) {
    const original = descriptor.value as (...args: unknown[]) => unknown;
    Object.defineProperty(zlib, name, {
      ...descriptor,
      value: (...args: unknown[]) => {
        count++;
        return original.apply(zlib, args);
      },
    });
  }
  // `import { inflateSync } from "node:zlib"` sees the wrappers too.
  syncBuiltinESMExports();
  try {
    const result = await run();
    return { result, count };
  } finally {
    globalThis.DecompressionStream = Original;
    for (const [name, descriptor] of saved) Object.defineProperty(zlib, name, descriptor);
    syncBuiltinESMExports();
  }
}
