import { DateTime } from 'luxon';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import PDFDocument from 'pdfkit';
import { capitalised, contactPhrase, LETTER_LOCALE, longDate, placeLine, PROCEDURE_WORDS, shortDate, toothWords } from './letter-format.util.js';
import { REPORT_CAUTION, type CompletionReportFacts } from './completion-report-letter.util.js';

type Weight = 'regular' | 'bold';

/** One of fontsource's unicode subsets of Manrope, with its WOFF files. */
interface FontSubset {
  name: string;
  ranges: [number, number][];
  files: Record<Weight, string>;
}

const TEAL = '#0f5c5c'; // the app's deep teal (client theme, lagoon 8)
const GREY = '#625a50'; // warm grey (stone 7)
const INK = '#2f2b26';

function parseRanges(css: string): [number, number][] {
  return css.split(',').map((part) => {
    const [a, b] = part.trim().replace(/^U\+/i, '').split('-');
    const from = parseInt(a!, 16);
    return [from, b ? parseInt(b, 16) : from];
  });
}

let manrope: FontSubset[] | null | undefined;
/** The WOFF files, read once per process. */
const fontFiles = new Map<string, Buffer>();

/**
 * Manrope as @fontsource/manrope ships it: WOFF/WOFF2 only, one file per unicode subset and weight.
 * pdfkit reads WOFF through fontkit, so the report uses the app's font; without the package (or its
 * latin subset) it falls back to the built-in Helvetica.
 */
export function manropeSubsets(): FontSubset[] | null {
  if (manrope !== undefined) return manrope;
  try {
    const dir = dirname(createRequire(import.meta.url).resolve('@fontsource/manrope/package.json'));
    const css = readFileSync(join(dir, '400.css'), 'utf8');
    const subsets: FontSubset[] = [];
    for (const block of css.split('@font-face').slice(1)) {
      const file = /url\(\.\/files\/manrope-([a-z-]+)-400-normal\.woff\)/.exec(block);
      const range = /unicode-range:\s*([^;]+);/.exec(block);
      if (!file || !range) continue;
      const files = { regular: join(dir, 'files', `manrope-${file[1]}-400-normal.woff`), bold: join(dir, 'files', `manrope-${file[1]}-700-normal.woff`) };
      if (existsSync(files.regular) && existsSync(files.bold)) subsets.push({ name: file[1]!, ranges: parseRanges(range[1]!), files });
    }
    manrope = subsets.some((s) => s.name === 'latin') ? subsets : null;
  } catch {
    manrope = null;
  }
  return manrope;
}

/** The font family the report is set in on this installation. */
export const reportFontFamily = () => (manropeSubsets() ? 'Manrope' : 'Helvetica');

/** Writes text in the right font subset per character run (fontsource splits Manrope by script). */
class Writer {
  private readonly registered = new Set<string>();

  constructor(
    readonly doc: PDFKit.PDFDocument,
    private readonly subsets: FontSubset[] | null,
  ) {}

  private fontFor(subset: number, weight: Weight): string {
    if (subset < 0 || !this.subsets) return weight === 'bold' ? 'Helvetica-Bold' : 'Helvetica';
    const name = `Manrope-${this.subsets[subset]!.name}-${weight}`;
    if (!this.registered.has(name)) {
      const file = this.subsets[subset]!.files[weight];
      if (!fontFiles.has(file)) fontFiles.set(file, readFileSync(file));
      this.doc.registerFont(name, fontFiles.get(file)!);
      this.registered.add(name);
    }
    return name;
  }

  private subsetOf(cp: number): number {
    if (!this.subsets) return -1;
    // Line breaks and spaces belong to the latin subset; keep them in the run they are in.
    return this.subsets.findIndex((s) => s.ranges.some(([a, b]) => cp >= a && cp <= b));
  }

  private runs(text: string): { text: string; subset: number }[] {
    const out: { text: string; subset: number }[] = [];
    for (const ch of text) {
      const cp = ch.codePointAt(0)!;
      const subset = cp === 10 || cp === 32 ? (out.at(-1)?.subset ?? this.subsetOf(cp)) : this.subsetOf(cp);
      const last = out.at(-1);
      if (last && last.subset === subset) last.text += ch;
      else out.push({ text: ch, subset });
    }
    return out.length ? out : [{ text: '', subset: this.subsetOf(32) }];
  }

  write(text: string, o: { weight?: Weight; size?: number; color?: string; x?: number; y?: number } & PDFKit.Mixins.TextOptions = {}) {
    const { weight = 'regular', size = 10.5, color = INK, x, y, ...options } = o;
    this.doc.fontSize(size).fillColor(color);
    const runs = this.runs(text);
    runs.forEach((r, i) => {
      this.doc.font(this.fontFor(r.subset, weight));
      const opts = { ...options, continued: i < runs.length - 1 };
      if (i === 0 && x !== undefined) this.doc.text(r.text, x, y, opts);
      else this.doc.text(r.text, opts);
    });
  }
}

/**
 * The completion report as a PDF (pdfkit): the practice's header, the referring dentist, the patient
 * (name and date of birth), the tooth (Universal and FDI), the procedure in words, each visit with its
 * local date, times and endodontist, the endodontist's findings, the recall plan with dates, and the
 * caution on every page. The same facts give the same bytes: the metadata dates come from the letter.
 */
export function renderCompletionReportPdf(f: CompletionReportFacts, opts: { compress?: boolean; font?: 'Manrope' | 'Helvetica' } = {}): Promise<Buffer> {
  const issued = new Date(f.issuedAt);
  const tooth = toothWords(f.toothFdi);
  const doc = new PDFDocument({
    size: 'LETTER',
    margins: { top: 54, bottom: 86, left: 60, right: 60 },
    compress: opts.compress ?? true,
    bufferPages: true,
    lang: 'en-US',
    displayTitle: true,
    info: {
      Title: `Completion report, tooth ${tooth.split(',')[0]}`,
      Author: f.practice.name,
      Subject: `Completion report for ${f.dentist.name}`,
      Creator: 'Ostium',
      Producer: 'Ostium',
      CreationDate: issued,
      ModDate: issued,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const w = new Writer(doc, opts.font === 'Helvetica' ? null : manropeSubsets());
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const labelWidth = 118;
  const zone = f.location.timeZone;

  const rule = () => {
    doc.moveDown(0.4);
    doc.moveTo(left, doc.y).lineTo(left + width, doc.y).lineWidth(0.8).strokeColor(TEAL).stroke();
    doc.moveDown(0.6);
  };
  const roomFor = (points: number) => {
    if (doc.y + points > doc.page.height - doc.page.margins.bottom) doc.addPage();
  };
  const heading = (text: string) => {
    roomFor(60);
    doc.moveDown(0.9);
    w.write(text, { x: left, y: doc.y, weight: 'bold', size: 12, color: TEAL, width });
    doc.moveDown(0.3);
  };
  const row = (label: string, value: string) => {
    roomFor(28);
    const y = doc.y;
    w.write(label, { x: left, y, weight: 'bold', size: 9.5, color: GREY, width: labelWidth - 8 });
    const afterLabel = doc.y;
    w.write(value, { x: left + labelWidth, y, width: width - labelWidth });
    doc.x = left;
    doc.y = Math.max(doc.y, afterLabel) + 3;
  };

  // Header: who writes.
  w.write(f.practice.name, { x: left, y: doc.y, weight: 'bold', size: 18, color: TEAL, width });
  const place = placeLine(f.location);
  if (place) w.write(place, { size: 9.5, color: GREY, width });
  const contact = contactPhrase(f.practice, f.location);
  if (contact) w.write(capitalised(contact), { size: 9.5, color: GREY, width });
  rule();

  w.write('Completion report', { x: left, y: doc.y, weight: 'bold', size: 15, width });
  w.write(`Issued ${shortDate(DateTime.fromJSDate(issued, { zone }).toISODate()!)}`, { size: 9.5, color: GREY, width });
  doc.moveDown(0.8);

  row('To', [f.dentist.name, f.dentist.practiceName].filter(Boolean).join(', '));
  row('Patient', `${f.patient.firstName} ${f.patient.lastName}`);
  row('Date of birth', shortDate(f.patient.dateOfBirth));
  row('Tooth', tooth);
  row('Procedure', capitalised(PROCEDURE_WORDS[f.procedure]));
  row('Referral received', shortDate(f.referralReceivedOn));
  row('Treatment ended', longDate(f.treatmentEndedOn));
  // Who treated is read off the visits; who wrote the report is signed below (not always the same person).
  const treatedBy = [...new Set(f.visits.map((v) => v.endodontist))];
  if (treatedBy.length) row(treatedBy.length === 1 ? 'Endodontist' : 'Endodontists', treatedBy.join(', '));

  heading('Visits');
  f.visits.forEach((v, i) => {
    const abbr = DateTime.fromISO(`${v.date}T${v.startTime}`, { zone, locale: LETTER_LOCALE }).toFormat('ZZZZ');
    row(`Visit ${i + 1}`, `${longDate(v.date)}, ${v.startTime}–${v.endTime} (${abbr}), ${v.endodontist}`);
  });

  heading('Findings');
  w.write(f.findings.trim(), { x: left, y: doc.y, width, lineGap: 2 });

  heading('Recall plan');
  if (f.recall.length === 0) w.write('No recall review planned.', { x: left, y: doc.y, width });
  for (const r of f.recall) row(`${r.months} months`, `Recall review due ${longDate(r.dueOn)}`);

  if (f.completedBy) {
    roomFor(40);
    doc.moveDown(1.2);
    w.write(`Report written by ${f.completedBy}`, { x: left, y: doc.y, width });
  }

  // The caution and page numbers on every page, inside the bottom margin.
  const pages = doc.bufferedPageRange();
  for (let i = pages.start; i < pages.start + pages.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - bottom + 18;
    doc.moveTo(left, y - 6).lineTo(left + width, y - 6).lineWidth(0.5).strokeColor(GREY).stroke();
    w.write(REPORT_CAUTION, { x: left, y, size: 8, color: GREY, width: width - 70 });
    w.write(`Page ${i - pages.start + 1} of ${pages.count}`, { x: left + width - 60, y, size: 8, color: GREY, width: 60, align: 'right' });
    doc.page.margins.bottom = bottom;
  }
  doc.flushPages();
  doc.end();
  return done;
}
