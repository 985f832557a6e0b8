import { deflateSync } from 'node:zlib';

// Tiny but complete files built byte by byte, so the tests need no fixtures on disk.

function crc32(bytes: Buffer): number {
  let c = ~0;
  for (const b of bytes) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}

function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}

/** A 1×1 PNG (PNG specification: signature, IHDR, IDAT, IEND, each chunk with its CRC-32). */
export function tinyPng(rgba: [number, number, number, number] = [42, 127, 122, 255]): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(1, 0); // width
  ihdr.writeUInt32BE(1, 4); // height
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type RGBA
  const raw = Buffer.from([0, ...rgba]); // filter byte 0, one pixel
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', deflateSync(raw)),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

/**
 * An 8×8 mid-grey baseline JPEG (ITU T.81): one component, a quantisation table of ones, one-code
 * Huffman tables (DC category 0, AC end-of-block), one block coded as the bits 00 padded with ones.
 */
export function tinyJpeg(): Buffer {
  const seg = (marker: number, body: number[]) => [0xff, marker, (body.length + 2) >> 8, (body.length + 2) & 0xff, ...body];
  const oneCode = (tableClassAndId: number) => [tableClassAndId, 1, ...Array(15).fill(0), 0x00];
  return Buffer.from([
    0xff, 0xd8, // SOI
    ...seg(0xe0, [0x4a, 0x46, 0x49, 0x46, 0x00, 1, 1, 0, 0, 1, 0, 1, 0, 0]), // APP0 JFIF
    ...seg(0xdb, [0x00, ...Array(64).fill(1)]), // DQT
    ...seg(0xc0, [8, 0, 8, 0, 8, 1, 1, 0x11, 0]), // SOF0 8×8, one component
    ...seg(0xc4, oneCode(0x00)), // DHT DC 0
    ...seg(0xc4, oneCode(0x10)), // DHT AC 0
    ...seg(0xda, [1, 1, 0x00, 0, 63, 0]), // SOS
    0x3f, // DC diff 0 ("0"), EOB ("0"), padded with ones
    0xff, 0xd9, // EOI
  ]);
}

/** A one-page PDF with a correct cross-reference table (ISO 32000-1 §7.5). */
export function tinyPdf(): Buffer {
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 72 72] >>',
  ];
  let out = '%PDF-1.4\n';
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(Buffer.byteLength(out));
    out += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = Buffer.byteLength(out);
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const off of offsets) out += `${String(off).padStart(10, '0')} 00000 n \n`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, 'latin1');
}

/** The start of a Linux executable (ELF magic 7F 45 4C 46, 64-bit, little-endian), padded to a header. */
export function elfExecutable(): Buffer {
  const b = Buffer.alloc(128);
  Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]).copy(b);
  b.writeUInt16LE(2, 16); // e_type: executable
  b.writeUInt16LE(0x3e, 18); // e_machine: x86-64
  return b;
}

/** A buffer just over the 20 MB (20 × 1024 × 1024 bytes) limit that starts like a PNG. */
export function oversizedPng(): Buffer {
  const b = Buffer.alloc(20 * 1024 * 1024 + 1024);
  tinyPng().copy(b);
  return b;
}
