import { describe, expect, it } from 'vitest';
import { readPdf } from '../../test/helpers/pdf-text.js';
import { composeCompletionReportEmail, REPORT_CAUTION, reportFileName, type CompletionReportFacts } from './completion-report-letter.util.js';
import { manropeSubsets, renderCompletionReportPdf } from './completion-report-pdf.util.js';

const facts: CompletionReportFacts = {
  practice: { name: 'Quillfern Endodontics', phone: '+12025550100', email: 'desk@quillfern-endo.test' },
  location: { name: 'Riverside', address: '14 Tannery Lane, Riverside Park, NY 10000', phone: '+12025550101', timeZone: 'America/New_York' },
  dentist: { name: 'Dr. Ottilie Farrow', practiceName: 'Farrow Family Dental' },
  patient: { firstName: 'Wren', lastName: 'Halloway', dateOfBirth: '1984-03-17' },
  toothFdi: '36',
  procedure: 'retreatment',
  referralReceivedOn: '2026-10-26',
  visits: [
    { date: '2026-10-30', startTime: '09:00', endTime: '10:30', endodontist: 'Dr. Imre Castellan' },
    { date: '2026-11-06', startTime: '13:00', endTime: '14:00', endodontist: 'Dr. Imre Castellan' },
  ],
  treatmentEndedOn: '2026-11-06',
  recall: [
    { months: 6, dueOn: '2027-05-06' },
    { months: 12, dueOn: '2027-11-06' },
  ],
  findings: 'Three canals located (MB, ML, D), working lengths confirmed.\nObturated with warm vertical compaction; please restore within four weeks.',
  completedBy: 'Dr. Imre Castellan',
  issuedAt: '2026-11-06T20:15:00.000Z',
};

// The PDFs are read back with test/helpers/pdf-text.ts: no PDF parser is installed (no pdfjs-dist or
// pdf-parse in node_modules), so it checks the cross-reference table, inflates the FlateDecode content
// streams with zlib.inflateSync and decodes the text through each font's ToUnicode CMap (ISO 32000-1).
describe('completion report PDF', () => {
  it('opens and holds the header, the parties, the tooth in both notations, the visits, findings, recall dates and the caution', async () => {
    const pdf = await renderCompletionReportPdf(facts);
    const doc = readPdf(pdf);
    expect(doc.problems).toEqual([]);
    expect(doc.pages).toHaveLength(1);
    const text = doc.pages[0]!;
    for (const line of [
      'Quillfern Endodontics',
      'Riverside, 14 Tannery Lane, Riverside Park, NY 10000',
      'Phone (202) 555-0101, e-mail desk@quillfern-endo.test',
      'Completion report',
      'Dr. Ottilie Farrow, Farrow Family Dental',
      'Wren Halloway',
      '17 March 1984',
      // Universal 19 is FDI 36 (ISO 3950 / HL7 crosswalk, references.md).
      '#19 (FDI 36), mandibular left first molar',
      'Root canal retreatment',
      // 30 October is still daylight time in New York, 6 November no longer (IANA zone data via luxon, references.md).
      'Friday 30 October 2026, 09:00–10:30 (EDT), Dr. Imre Castellan',
      'Friday 6 November 2026, 13:00–14:00 (EST), Dr. Imre Castellan',
      'Three canals located (MB, ML, D), working lengths confirmed.',
      'Recall review due Thursday 6 May 2027',
      'Recall review due Saturday 6 November 2027',
      // Who treated (from the visits) and who wrote the report, each on its own line.
      'Endodontist',
      'Report written by Dr. Imre Castellan',
      'Page 1 of 1',
    ]) {
      expect(text, line).toContain(line);
    }
    // The caution of product.md ("Cautions the product shows"), wrapped over two footer lines.
    expect(text.replace(/\s*\n\s*/g, ' ')).toContain(REPORT_CAUTION);
    expect(REPORT_CAUTION).toContain('Clinical decisions rest with the treating clinician, under local regulations and licensed practice.');
  });

  it('sets deterministic metadata from the letter: title, author = the practice, creation date', async () => {
    const a = await renderCompletionReportPdf(facts);
    const b = await renderCompletionReportPdf(facts);
    expect(a.equals(b)).toBe(true);
    const { info } = readPdf(a);
    expect(info).toMatchObject({ Title: 'Completion report, tooth #19 (FDI 36)', Author: 'Quillfern Endodontics', CreationDate: 'D:20261106201500Z', ModDate: 'D:20261106201500Z' });
    const later = await renderCompletionReportPdf({ ...facts, issuedAt: '2026-11-07T08:00:00.000Z' });
    expect(readPdf(later).info.CreationDate).toBe('D:20261107080000Z');
    expect(later.equals(a)).toBe(false);
  });

  it('is set in Manrope from @fontsource/manrope (WOFF, read by pdfkit through fontkit), a subset per script', async () => {
    expect(manropeSubsets()?.map((s) => s.name)).toContain('latin');
    const pdf = await renderCompletionReportPdf({ ...facts, patient: { ...facts.patient, firstName: 'Łucja' } }, { compress: false });
    const raw = pdf.toString('latin1');
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+Manrope-Regular/);
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+Manrope-Bold/);
    expect(raw).not.toContain('/Helvetica');
    // Ł (U+0141) is only in the latin-ext file: the name is still whole.
    expect(readPdf(pdf).pages[0]).toContain('Łucja Halloway');
  });

  it('falls back to the built-in Helvetica with the same text', async () => {
    const pdf = await renderCompletionReportPdf(facts, { font: 'Helvetica' });
    const doc = readPdf(pdf);
    expect(doc.problems).toEqual([]);
    expect(pdf.toString('latin1')).toContain('/BaseFont /Helvetica');
    expect(doc.pages[0]).toContain('#19 (FDI 36), mandibular left first molar');
    expect(doc.pages[0]).toContain('Friday 6 November 2026, 13:00–14:00 (EST)');
  });

  it('runs onto more pages for long findings, with the caution on each', async () => {
    const findings = Array.from({ length: 40 }, (_, i) => `Finding ${i + 1}: ${'the mesiobuccal canal was negotiated to length and shaped; '.repeat(2)}`).join('\n').slice(0, 4000);
    const doc = readPdf(await renderCompletionReportPdf({ ...facts, findings }));
    expect(doc.problems).toEqual([]);
    expect(doc.pages.length).toBeGreaterThan(1);
    doc.pages.forEach((p, i) => {
      expect(p.replace(/\s*\n\s*/g, ' ')).toContain(REPORT_CAUTION);
      expect(p).toContain(`Page ${i + 1} of ${doc.pages.length}`);
    });
    expect(doc.pages.join('\n')).toContain('Recall review due Saturday 6 November 2027');
  });

  it('says when no recall review is planned', async () => {
    expect(readPdf(await renderCompletionReportPdf({ ...facts, recall: [] })).pages[0]).toContain('No recall review planned.');
  });
});

describe('completion report e-mail', () => {
  it('says whose treatment ended and that the report is attached; the clinical detail stays in the PDF', () => {
    const m = composeCompletionReportEmail(facts);
    expect(m.subject).toBe('Completion report – Quillfern Endodontics');
    expect(m.text).toContain('the root canal retreatment of your patient Wren Halloway, tooth #19 (FDI 36), mandibular left first molar, ended on 6 November 2026.');
    expect(m.text).toContain('attached as a PDF');
    for (const clinical of ['canals', 'Obturated', '1984', 'Recall review']) expect(m.text).not.toContain(clinical);
    expect(reportFileName(facts)).toBe('completion-report-fdi-36-2026-11-06.pdf');
  });
});
