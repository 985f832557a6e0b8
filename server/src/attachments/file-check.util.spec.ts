import { describe, expect, it } from 'vitest';
import { elfExecutable, tinyJpeg, tinyPdf, tinyPng } from '../../test/helpers/sample-files.js';
import { checkUploadContent, cleanFileName, contentDisposition, defaultKind } from './file-check.util.js';

describe('upload content check', () => {
  it('accepts JPEG, PNG and PDF by their bytes', async () => {
    // Magic numbers: PNG 89 50 4E 47 0D 0A 1A 0A (PNG spec), JPEG FF D8 FF (ITU T.81), PDF "%PDF-" (ISO 32000-1).
    expect(await checkUploadContent(tinyPng())).toEqual({ ok: true, mime: 'image/png', ext: 'png' });
    expect(await checkUploadContent(tinyJpeg())).toEqual({ ok: true, mime: 'image/jpeg', ext: 'jpg' });
    expect(await checkUploadContent(tinyPdf())).toEqual({ ok: true, mime: 'application/pdf', ext: 'pdf' });
  });

  it('refuses anything else, naming what the content really is', async () => {
    expect(await checkUploadContent(elfExecutable())).toEqual({
      ok: false,
      detected: 'application/x-elf',
      message: "The file's content is application/x-elf (.elf), not a JPEG, PNG or PDF; only those are accepted",
    });
    const exe = Buffer.alloc(256);
    exe.write('MZ');
    expect(await checkUploadContent(exe)).toMatchObject({ ok: false, detected: 'application/x-msdownload' });
    const gif = Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00', 'latin1');
    expect(await checkUploadContent(gif)).toMatchObject({ ok: false, detected: 'image/gif' });
    expect(await checkUploadContent(Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'))).toMatchObject({ ok: false, detected: null, message: expect.stringMatching(/not a recognised type/) });
    expect(await checkUploadContent(Buffer.alloc(0))).toMatchObject({ ok: false, message: expect.stringMatching(/empty/) });
  });

  it('ignores what the bytes are called: a PNG is a PNG whatever the name', async () => {
    const png = tinyPng();
    expect((await checkUploadContent(png)).ok).toBe(true);
    expect(defaultKind('image/png')).toBe('radiograph');
    expect(defaultKind('image/jpeg')).toBe('radiograph');
    expect(defaultKind('application/pdf')).toBe('letter');
  });
});

describe('file names', () => {
  it('keeps only the last path part, without control characters', () => {
    expect(cleanFileName('C:\\scans\\..\\pa 36.png')).toBe('pa 36.png');
    expect(cleanFileName('../../etc/passwd')).toBe('passwd');
    expect(cleanFileName('bite\u0000wing\n.jpg')).toBe('bitewing.jpg');
    expect(cleanFileName('')).toBe('upload');
    expect(cleanFileName(undefined)).toBe('upload');
    expect(cleanFileName('x'.repeat(300) + '.png')).toHaveLength(255);
  });

  it('writes Content-Disposition with an ASCII fallback and the UTF-8 name (RFC 6266, RFC 5987)', () => {
    expect(contentDisposition('inline', 'pa-36.png')).toBe(`inline; filename="pa-36.png"; filename*=UTF-8''pa-36.png`);
    expect(contentDisposition('inline', 'Esmé "final".pdf')).toBe(`inline; filename="Esm_ _final_.pdf"; filename*=UTF-8''Esm%C3%A9%20%22final%22.pdf`);
  });
});
