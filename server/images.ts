// Images judged by their own bytes: their type from the first bytes, their size from the header,
// and for images the server decodes itself (the logo, which pdfkit draws into PDFs) the PNG pixel
// data inflated only up to what the header says. Used by uploads, attachments and the PDFs.
import { inflateRawSync } from "node:zlib";
import { AppError } from "./errors.js";

/** What an image upload may be: judged from the file's own first bytes and header, never its name. */
export interface ImagePolicy {
  /** The noun in messages ("logo", "photo"). */
  noun: string;
  /** Largest width or height, px. */
  maxSide: number;
  /** Largest width × height, px. */
  maxPixels: number;
  /**
   * Refuse anything but a PNG or JPEG whose size can be read, and a PNG whose pixel data inflates
   * to more than its header says (a decompression bomb): for images the server decodes itself.
   */
  decodedHere: boolean;
}

/**
 * The company logo. pdfkit decodes every pixel of a PNG logo with transparency into each quote, cut
 * list and receipt PDF (server/pdf/pdf-document.ts: about 8 bytes per pixel at once, more for 16-bit
 * PNGs), and the quote page shows it in the client's browser; it prints at most 150 × 48 pt.
 */
export const LOGO_IMAGES: ImagePolicy = { noun: "logo", maxSide: 4096, maxPixels: 4_000_000, decodedHere: true };

/**
 * Site photos and plans attached to a job. The server never decodes them; browsers do, for the
 * thumbnails (4 bytes per pixel). 150 megapixels is more than a phone camera's 10 MB JPEG holds.
 */
export const PHOTO_IMAGES: ImagePolicy = { noun: "image", maxSide: 20_000, maxPixels: 150_000_000, decodedHere: false };


const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

export interface ImageHeader {
  type: "image/png" | "image/jpeg";
  width: number;
  height: number;
}

/** "image/png" or "image/jpeg" from the first bytes alone; null for anything else. */
export function imageTypeOf(bytes: Buffer): ImageHeader["type"] | null {
  if (bytes.length >= 8 && bytes.subarray(0, 8).equals(PNG_SIGNATURE)) return "image/png";
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg";
  return null;
}

/**
 * The width and height a PNG or JPEG says it has, read from its header without decoding anything
 * (no image-size package is installed; both layouts are short):
 * - PNG: the IHDR chunk must come first; width and height are its first two 32-bit big-endian
 *   numbers (PNG specification, 11.2.2).
 * - JPEG: walk the marker segments from the start; the first SOF marker (C0–CF except C4 DHT,
 *   C8 JPG and CC DAC) holds precision (1 byte), height and width (16-bit big-endian each)
 *   (ITU-T T.81, B.2.2). A height of 0 (set later by a DNL marker) counts as unreadable.
 * null when the file is neither or its header cannot be read.
 */
export function readImageHeader(bytes: Buffer): ImageHeader | null {
  const type = imageTypeOf(bytes);
  if (type === "image/png") {
    if (bytes.length < 24 || bytes.toString("latin1", 12, 16) !== "IHDR") return null;
    const width = bytes.readUInt32BE(16);
    const height = bytes.readUInt32BE(20);
    return width > 0 && height > 0 ? { type, width, height } : null;
  }
  if (type === "image/jpeg") {
    let i = 2;
    while (i + 4 <= bytes.length) {
      if (bytes[i] !== 0xff) return null;
      const marker = bytes[i + 1];
      // Fill bytes before a marker.
      if (marker === 0xff) {
        i += 1;
        continue;
      }
      // Markers without a length: TEM, RST0–7, SOI.
      if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd8)) {
        i += 2;
        continue;
      }
      // End of image or start of scan before any frame header: no size to read.
      if (marker === 0xd9 || marker === 0xda) return null;
      const length = bytes.readUInt16BE(i + 2);
      if (length < 2) return null;
      if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
        if (i + 9 > bytes.length) return null;
        const height = bytes.readUInt16BE(i + 5);
        const width = bytes.readUInt16BE(i + 7);
        return width > 0 && height > 0 ? { type, width, height } : null;
      }
      i += 2 + length;
    }
  }
  return null;
}

/** Bytes of a PNG's filtered, decompressed pixel data for its header (PNG specification, 7 and 8.2). */
function pngRawLength(bytes: Buffer, width: number, height: number): number | null {
  const depth = bytes[24];
  const channels = ({ 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 } as Record<number, number>)[bytes[25]];
  if (!channels || ![1, 2, 4, 8, 16].includes(depth)) return null;
  const rowBytes = (w: number) => 1 + Math.ceil((w * depth * channels) / 8);
  if (bytes[28] !== 1) return height * rowBytes(width);
  // Adam7: seven passes over sub-images, each row with its own filter byte.
  const passes = [
    [0, 0, 8, 8],
    [4, 0, 8, 8],
    [0, 4, 4, 8],
    [2, 0, 4, 4],
    [0, 2, 2, 4],
    [1, 0, 2, 2],
    [0, 1, 1, 2],
  ];
  let total = 0;
  for (const [x0, y0, dx, dy] of passes) {
    const w = Math.ceil((width - x0) / dx);
    const h = Math.ceil((height - y0) / dy);
    if (w > 0 && h > 0) total += h * rowBytes(w);
  }
  return total;
}

/** The concatenated IDAT chunks of a PNG; null when its chunks are damaged. */
function pngPixelData(bytes: Buffer): Buffer | null {
  const parts: Buffer[] = [];
  let i = 8;
  while (i + 12 <= bytes.length) {
    const length = bytes.readUInt32BE(i);
    const type = bytes.toString("latin1", i + 4, i + 8);
    if (i + 12 + length > bytes.length) return null;
    if (type === "IDAT") parts.push(bytes.subarray(i + 8, i + 8 + length));
    if (type === "IEND") break;
    i += 12 + length;
  }
  return parts.length ? Buffer.concat(parts) : null;
}

const megapixels = (n: number) => `${Math.round(n / 100_000) / 10} megapixels`;

/**
 * Refuses (422, naming the field) an image whose header claims more pixels than the policy allows.
 * With `decodedHere`, also anything that is not a readable PNG or JPEG (415), and a PNG whose pixel
 * data inflates past what its header says: that inflation stops at the expected size, so a bomb
 * costs at most the memory of an allowed image.
 */
export function checkImage(bytes: Buffer, policy: ImagePolicy, field = "file"): ImageHeader | null {
  const header = readImageHeader(bytes);
  if (!header) {
    if (!policy.decodedHere) return null;
    if (!imageTypeOf(bytes)) throw new AppError("unsupported_media_type", `${field}: the ${policy.noun} must be a PNG or JPEG image`, { field });
    throw new AppError("unprocessable", `${field}: the ${policy.noun}'s width and height could not be read; save it again as PNG or JPEG`, { field });
  }
  const { width, height } = header;
  if (width > policy.maxSide || height > policy.maxSide || width * height > policy.maxPixels) {
    throw new AppError(
      "unprocessable",
      `${field}: the ${policy.noun} is ${width} × ${height} pixels; it may be at most ${policy.maxSide} pixels wide or high and ${megapixels(policy.maxPixels)} in all`,
      { field, width, height, maxSide: policy.maxSide, maxPixels: policy.maxPixels },
    );
  }
  if (policy.decodedHere && header.type === "image/png") {
    const expected = pngRawLength(bytes, width, height);
    const data = pngPixelData(bytes);
    const damaged = () => new AppError("unprocessable", `${field}: the ${policy.noun}'s pixel data is damaged or larger than its ${width} × ${height} pixels; save it again as PNG`, { field });
    if (expected === null || data === null) throw damaged();
    // A zlib stream: 2 header bytes (method 8, deflate), the deflate data, then an Adler-32 check that
    // is not ours to judge (RFC 1950). Inflating stops with ERR_BUFFER_TOO_LARGE as soon as the output
    // would pass the expected size.
    if (data.length < 2 || (data[0] & 0x0f) !== 8) throw damaged();
    try {
      if (inflateRawSync(data.subarray(2), { maxOutputLength: expected }).length < expected) throw damaged();
    } catch (error) {
      if (error instanceof AppError) throw error;
      throw damaged();
    }
  }
  return header;
}
