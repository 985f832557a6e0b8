import { inflateSync } from 'node:zlib';

// A small PDF reader for the tests. No PDF parser is installed (neither pdfjs-dist nor pdf-parse is in
// node_modules), so this reads the file the way a viewer starts to: the cross-reference table must
// point at every object (ISO 32000-1 §7.5.4), FlateDecode streams are inflated with zlib, fonts are
// decoded through their ToUnicode CMaps (§9.10.3) or WinAnsiEncoding (Annex D), and the text shown by
// Tj / TJ is collected line by line. It knows nothing of how the report was written.

export interface PdfObject {
  id: number;
  dict: string;
  stream: Buffer | null;
}

export interface PdfDocument {
  objects: Map<number, PdfObject>;
  /** Text per page, lines joined with \n. */
  pages: string[];
  info: Record<string, string>;
  /** Problems a viewer would trip over; empty for a sound file. */
  problems: string[];
}

// WinAnsiEncoding differs from Latin-1 only in 0x80–0x9F (ISO 32000-1 Annex D.2).
const WIN_ANSI: Record<number, string> = {
  0x80: '€', 0x82: '‚', 0x83: 'ƒ', 0x84: '„', 0x85: '…', 0x86: '†', 0x87: '‡', 0x88: 'ˆ', 0x89: '‰', 0x8a: 'Š', 0x8b: '‹', 0x8c: 'Œ',
  0x8e: 'Ž', 0x91: '‘', 0x92: '’', 0x93: '“', 0x94: '”', 0x95: '•', 0x96: '–', 0x97: '—', 0x98: '˜', 0x99: '™', 0x9a: 'š', 0x9b: '›',
  0x9c: 'œ', 0x9e: 'ž', 0x9f: 'Ÿ',
};

const hexBytes = (hex: string) => Buffer.from(hex.replace(/\s+/g, '').padEnd(Math.ceil(hex.replace(/\s+/g, '').length / 2) * 2, '0'), 'hex');
const utf16be = (b: Buffer) => {
  let s = '';
  for (let i = 0; i + 1 < b.length; i += 2) s += String.fromCharCode(b.readUInt16BE(i));
  return s;
};

/** A literal string's bytes: `(…)` with its escapes (§7.3.4.2). */
function literalBytes(src: string): Buffer {
  const out: number[] = [];
  for (let i = 0; i < src.length; i++) {
    const c = src[i]!;
    if (c !== '\\') {
      out.push(c.charCodeAt(0) & 0xff);
      continue;
    }
    const n = src[++i]!;
    const simple: Record<string, number> = { n: 10, r: 13, t: 9, b: 8, f: 12, '(': 40, ')': 41, '\\': 92 };
    if (n in simple) out.push(simple[n]!);
    else if (/[0-7]/.test(n)) {
      let oct = n;
      while (oct.length < 3 && /[0-7]/.test(src[i + 1] ?? '')) oct += src[++i];
      out.push(parseInt(oct, 8) & 0xff);
    } else if (n === '\n') continue;
    else out.push(n.charCodeAt(0));
  }
  return Buffer.from(out);
}

/** A text string (metadata): UTF-16BE with a byte-order mark, or PDFDocEncoding (read as Latin-1). */
const textString = (b: Buffer) => (b[0] === 0xfe && b[1] === 0xff ? utf16be(b.subarray(2)) : b.toString('latin1'));

function parseObjects(raw: string, buf: Buffer): Map<number, PdfObject> {
  const objects = new Map<number, PdfObject>();
  const re = /(\d+) 0 obj\b/g;
  for (let m = re.exec(raw); m; m = re.exec(raw)) {
    const id = Number(m[1]);
    const start = m.index + m[0].length;
    const endobj = raw.indexOf('endobj', start);
    const s = raw.indexOf('stream', start);
    if (s < 0 || s > endobj) {
      objects.set(id, { id, dict: raw.slice(start, endobj).trim(), stream: null });
      re.lastIndex = endobj;
      continue;
    }
    const dict = raw.slice(start, s);
    let from = s + 'stream'.length;
    if (raw[from] === '\r') from++;
    if (raw[from] === '\n') from++;
    const len = /\/Length (\d+)(?! \d+ R)/.exec(dict);
    const to = len ? from + Number(len[1]) : raw.indexOf('endstream', from);
    let stream = buf.subarray(from, to);
    if (/\/Filter\s*\/FlateDecode/.test(dict)) stream = inflateSync(stream);
    objects.set(id, { id, dict: dict.trim(), stream });
    // Binary stream data may hold anything; the object ends after its declared length.
    re.lastIndex = raw.indexOf('endobj', to);
  }
  return objects;
}

/** The xref table: every in-use entry must point at its own `N G obj` (what a viewer checks to open the file). */
function checkXref(raw: string): string[] {
  const problems: string[] = [];
  if (!raw.startsWith('%PDF-')) problems.push('no %PDF- header');
  if (!/%%EOF\s*$/.test(raw)) problems.push('no %%EOF at the end');
  const sx = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(raw);
  if (!sx) return [...problems, 'no startxref'];
  const at = Number(sx[1]);
  if (!raw.startsWith('xref', at)) return [...problems, `startxref ${at} does not point at the xref table`];
  const lines = raw.slice(at).split(/\r?\n/);
  let i = 1;
  while (i < lines.length && /^\d+ \d+$/.test(lines[i]!.trim())) {
    const [first, count] = lines[i]!.trim().split(' ').map(Number) as [number, number];
    for (let k = 0; k < count; k++) {
      const e = /^(\d{10}) (\d{5}) ([nf])/.exec(lines[i + 1 + k] ?? '');
      if (!e) {
        problems.push(`xref entry ${first + k} is malformed`);
        continue;
      }
      if (e[3] === 'n' && !raw.startsWith(`${first + k} ${Number(e[2])} obj`, Number(e[1]))) problems.push(`xref entry ${first + k} points at ${Number(e[1])}, not at its object`);
    }
    i += count + 1;
  }
  if (!/trailer\s*<<[\s\S]*\/Root \d+ 0 R/.test(raw.slice(at))) problems.push('the trailer names no /Root');
  return problems;
}

/** code → text of one font: its ToUnicode CMap, or WinAnsi for a simple font without one. */
function fontDecoder(font: PdfObject, objects: Map<number, PdfObject>): { bytes: number; map: (code: number) => string } {
  const tu = /\/ToUnicode (\d+) 0 R/.exec(font.dict);
  if (!tu) return { bytes: 1, map: (c) => WIN_ANSI[c] ?? String.fromCharCode(c) };
  const cmap = objects.get(Number(tu[1]))?.stream?.toString('latin1') ?? '';
  const table = new Map<number, string>();
  for (const block of cmap.match(/beginbfchar([\s\S]*?)endbfchar/g) ?? []) {
    for (const m of block.matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F\s]+)>/g)) table.set(parseInt(m[1]!, 16), utf16be(hexBytes(m[2]!)));
  }
  for (const block of cmap.match(/beginbfrange([\s\S]*?)endbfrange/g) ?? []) {
    for (const m of block.matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F]+)>\s*(\[[^\]]*\]|<[0-9a-fA-F\s]+>)/g)) {
      const lo = parseInt(m[1]!, 16);
      const hi = parseInt(m[2]!, 16);
      if (m[3]!.startsWith('[')) {
        // A ligature's destination holds several code units (<0066 0069> for "fi").
        [...m[3]!.matchAll(/<([0-9a-fA-F\s]+)>/g)].forEach((d, k) => table.set(lo + k, utf16be(hexBytes(d[1]!))));
      } else {
        const base = hexBytes(m[3]!.slice(1, -1));
        for (let c = lo; c <= hi; c++) {
          const b = Buffer.from(base);
          b.writeUInt16BE(b.readUInt16BE(b.length - 2) + (c - lo), b.length - 2);
          table.set(c, utf16be(b));
        }
      }
    }
  }
  const twoByte = /<0000>\s*<ffff>/i.test(cmap) || /Identity-H/.test(font.dict);
  return { bytes: twoByte ? 2 : 1, map: (c) => table.get(c) ?? '\ufffd' };
}

function decodeShown(bytes: Buffer, dec: { bytes: number; map: (code: number) => string }): string {
  let s = '';
  for (let i = 0; i + dec.bytes - 1 < bytes.length; i += dec.bytes) s += dec.map(dec.bytes === 2 ? bytes.readUInt16BE(i) : bytes[i]!);
  return s;
}

/** Text of one content stream: shown strings in order, a new line whenever the text position moves down. */
function contentText(content: string, fonts: Map<string, { bytes: number; map: (code: number) => string }>): string {
  let out = '';
  let font: { bytes: number; map: (code: number) => string } = { bytes: 1, map: (c) => String.fromCharCode(c) };
  let lastY: number | null = null;
  const token = /\/([A-Za-z0-9_.-]+)\s+[\d.]+\s+Tf|([-\d.]+)\s+([-\d.]+)\s+T[dD]|[-\d.]+\s+[-\d.]+\s+[-\d.]+\s+[-\d.]+\s+[-\d.]+\s+([-\d.]+)\s+Tm|\[((?:<[0-9a-fA-F\s]*>|\((?:\\.|[^\\)])*\)|[-\d.\s])*)\]\s*TJ|<([0-9a-fA-F\s]*)>\s*Tj|\(((?:\\.|[^\\)])*)\)\s*Tj|\bT\*/g;
  const moveTo = (y: number) => {
    if (lastY !== null && Math.abs(y - lastY) > 0.5) out += '\n';
    lastY = y;
  };
  for (const m of content.matchAll(token)) {
    if (m[1] !== undefined) font = fonts.get(m[1]) ?? font;
    else if (m[3] !== undefined) moveTo((lastY ?? 0) + Number(m[3]));
    else if (m[4] !== undefined) moveTo(Number(m[4]));
    else if (m[5] !== undefined) {
      for (const part of m[5].matchAll(/<([0-9a-fA-F\s]*)>|\(((?:\\.|[^\\)])*)\)/g)) {
        out += decodeShown(part[1] !== undefined ? hexBytes(part[1]) : literalBytes(part[2]!), font);
      }
    } else if (m[6] !== undefined) out += decodeShown(hexBytes(m[6]), font);
    else if (m[7] !== undefined) out += decodeShown(literalBytes(m[7]), font);
    else out += '\n';
  }
  return out;
}

export function readPdf(buf: Buffer): PdfDocument {
  const raw = buf.toString('latin1');
  const problems = checkXref(raw);
  const objects = parseObjects(raw, buf);

  // Font resources by name (/F1 7 0 R) → decoder.
  const fonts = new Map<string, { bytes: number; map: (code: number) => string }>();
  for (const o of objects.values()) {
    const block = /\/Font\s*<<([\s\S]*?)>>/.exec(o.dict);
    if (!block) continue;
    for (const m of block[1]!.matchAll(/\/([A-Za-z0-9_.-]+)\s+(\d+) 0 R/g)) {
      const f = objects.get(Number(m[2]));
      if (f) fonts.set(m[1]!, fontDecoder(f, objects));
    }
  }

  // Pages in the order of the page tree's /Kids, each with its /Contents.
  const root = objects.get(Number(/\/Root (\d+) 0 R/.exec(raw.slice(raw.lastIndexOf('trailer')))?.[1]));
  const treeId = Number(/\/Pages (\d+) 0 R/.exec(root?.dict ?? '')?.[1]);
  const kids = [...(/\/Kids\s*\[([^\]]*)\]/.exec(objects.get(treeId)?.dict ?? '')?.[1] ?? '').matchAll(/(\d+) 0 R/g)].map((k) => Number(k[1]));
  if (!kids.length) problems.push('the page tree has no pages');
  const pages = kids.map((id) => {
    const page = objects.get(id);
    const refs = [...(/\/Contents\s*(\[[^\]]*\]|\d+ 0 R)/.exec(page?.dict ?? '')?.[1] ?? '').matchAll(/(\d+) 0 R/g)].map((r) => Number(r[1]));
    return refs.map((r) => contentText(objects.get(r)?.stream?.toString('latin1') ?? '', fonts)).join('\n');
  });

  const info: Record<string, string> = {};
  const infoObj = objects.get(Number(/\/Info (\d+) 0 R/.exec(raw.slice(raw.lastIndexOf('trailer')))?.[1]));
  // Each entry is a string, or a reference to an object that is one (pdfkit writes them that way).
  const stringOf = (v: string): string | null => {
    const lit = /^\(((?:\\.|[^\\)])*)\)/.exec(v);
    if (lit) return textString(literalBytes(lit[1]!));
    const hex = /^<([0-9a-fA-F\s]*)>/.exec(v);
    if (hex) return textString(hexBytes(hex[1]!));
    const ref = /^(\d+) 0 R/.exec(v);
    return ref ? stringOf(objects.get(Number(ref[1]))?.dict ?? '') : null;
  };
  for (const m of (infoObj?.dict ?? '').matchAll(/\/(\w+)\s*(\((?:\\.|[^\\)])*\)|<[0-9a-fA-F\s]*>|\d+ 0 R)/g)) {
    const v = stringOf(m[2]!);
    if (v !== null) info[m[1]!] = v;
  }
  return { objects, pages, info, problems };
}

/** All the text of a PDF, pages joined with a form feed. */
export const pdfText = (buf: Buffer) => readPdf(buf).pages.join('\f');
