import type { AttachmentSummary, LocationSummary } from '@ostium/shared';
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { elfExecutable, oversizedPng, tinyJpeg, tinyPdf, tinyPng } from './helpers/sample-files.js';
import { createTestApp, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

describe('attachments', () => {
  let t: TestApp;
  let uploadDir: string;
  let frontdesk: Agent;
  let endodontist: Agent;
  let manager: Agent;
  let assistant: Agent;
  let locationId: number;

  beforeAll(async () => {
    uploadDir = await mkdtemp(join(tmpdir(), 'ostium-uploads-'));
    t = await createTestApp({ uploadDir });
    [frontdesk, endodontist, manager, assistant] = await Promise.all([t.as('frontdesk'), t.as('endodontist'), t.as('manager'), t.as('assistant')]);
    locationId = ((await frontdesk.get('/api/locations')).body as LocationSummary[])[0]!.id;
  });
  afterAll(async () => t?.close());

  const upload = (bytes: Buffer, filename: string, contentType: string, fields: Record<string, string> = {}, agent: Agent = frontdesk) => {
    let req = agent.post('/api/attachments');
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    return req.attach('file', bytes, { filename, contentType });
  };
  const stored = async () => (await readdir(uploadDir)).sort();

  it('accepts a real PNG, JPEG and PDF, detecting the type from the bytes and storing each under a random name', async () => {
    const files: [Buffer, string, string, AttachmentSummary['mimeType'], AttachmentSummary['kind']][] = [
      [tinyPng(), 'periapical 36.png', 'image/png', 'image/png', 'radiograph'],
      [tinyJpeg(), 'bitewing.jpg', 'image/jpeg', 'image/jpeg', 'radiograph'],
      [tinyPdf(), 'referral letter.pdf', 'application/pdf', 'application/pdf', 'letter'],
    ];
    for (const [bytes, name, declared, mime, kind] of files) {
      const before = await stored();
      const res = await upload(bytes, name, declared);
      expect(res.status, name).toBe(201);
      expect(res.body).toEqual({ id: expect.any(Number), referralId: null, fileName: name, mimeType: mime, sizeBytes: bytes.length, kind, createdAt: expect.any(String) });
      const added = (await stored()).filter((f) => !before.includes(f));
      expect(added).toHaveLength(1);
      // A random hex name: nothing of the uploader's name or extension reaches the disk.
      expect(added[0]).toMatch(/^[0-9a-f]{32}$/);
      expect(sha256(await readFile(join(uploadDir, added[0]!)))).toBe(sha256(bytes));
    }
  });

  it('ignores the declared name and type: PNG bytes called scan.pdf are a PNG', async () => {
    const res = await upload(tinyPng(), 'scan.pdf', 'application/pdf');
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ mimeType: 'image/png', kind: 'radiograph', fileName: 'scan.pdf' });
    const asLetter = await upload(tinyPng(), 'scan.png', 'image/png', { kind: 'letter' });
    expect(asLetter.body.kind).toBe('letter');
  });

  it('refuses a renamed executable with 415 naming what it really is, and stores nothing', async () => {
    const before = await stored();
    const res = await upload(elfExecutable(), 'x.png', 'image/png');
    expect(res.status).toBe(415);
    expect(res.body).toEqual({
      statusCode: 415,
      message: "The file's content is application/x-elf (.elf), not a JPEG, PNG or PDF; only those are accepted",
      errors: [{ field: 'file', message: 'content is application/x-elf' }],
    });
    const text = await upload(Buffer.from('just some text, honestly an image'), 'xray.jpg', 'image/jpeg');
    expect(text.status).toBe(415);
    expect(text.body.message).toMatch(/not a recognised type/);
    expect(await stored()).toEqual(before);
  });

  it('refuses a file over 20 MB with 413, and the referral is then saved with the other files', async () => {
    const good = await upload(tinyPng(), 'pa-46.png', 'image/png');
    const letter = await upload(tinyPdf(), 'letter.pdf', 'application/pdf');
    const before = await stored();
    const big = await upload(oversizedPng(), 'cbct-export.png', 'image/png');
    expect(big.status).toBe(413);
    expect(big.body).toEqual({
      statusCode: 413,
      message: 'The file is larger than the 20 MB limit per file; it was not stored',
      errors: [{ field: 'file', message: 'larger than 20 MB' }],
    });
    expect(await stored()).toEqual(before);

    const r = await frontdesk.post('/api/referrals').send({
      patient: { firstName: 'Odile', lastName: `Marchbank${Date.now()}`, dateOfBirth: '1969-09-09' },
      referringDentist: { name: 'Dr. Tamsin Rooke', email: null },
      locationId,
      urgency: 'soon',
      procedure: 'retreatment',
      teeth: [{ tooth: '30' }],
      attachmentIds: [good.body.id, letter.body.id],
    });
    expect(r.status).toBe(201);
    expect(r.body.attachments.map((a: AttachmentSummary) => [a.id, a.fileName, a.kind])).toEqual([
      [good.body.id, 'pa-46.png', 'radiograph'],
      [letter.body.id, 'letter.pdf', 'letter'],
    ]);
  });

  it('names the missing or misplaced file and bad fields', async () => {
    const none = await frontdesk.post('/api/attachments').field('kind', 'radiograph');
    expect(none.status).toBe(400);
    expect(none.body.errors).toEqual([{ field: 'file', message: 'is required' }]);
    const json = await frontdesk.post('/api/attachments').send({});
    expect(json.status).toBe(400);
    const wrongField = await frontdesk.post('/api/attachments').attach('upload', tinyPng(), 'a.png');
    expect(wrongField.status).toBe(400);
    expect(wrongField.body.errors).toEqual([{ field: 'upload', message: 'unexpected file' }]);
    const badKind = await upload(tinyPng(), 'a.png', 'image/png', { kind: 'photo' });
    expect(badKind.status).toBe(400);
    expect(badKind.body.errors.map((e: { field: string }) => e.field)).toEqual(['kind']);
    const noReferral = await upload(tinyPng(), 'a.png', 'image/png', { referralId: '999999' });
    expect(noReferral.status).toBe(400);
    expect(noReferral.body.errors).toEqual([{ field: 'referralId', message: 'does not exist' }]);
  });

  it('links at upload time when a referral is given', async () => {
    const r = await frontdesk.post('/api/referrals').send({
      patient: { firstName: 'Piran', lastName: `Greatorex${Date.now()}`, dateOfBirth: '1988-03-03' },
      referringDentist: { name: 'Dr. Tamsin Rooke', email: null },
      locationId,
      urgency: 'routine',
      procedure: 'initial',
      teeth: [{ tooth: '8' }],
    });
    const res = await upload(tinyJpeg(), 'later.jpg', 'image/jpeg', { referralId: String(r.body.id) });
    expect(res.status).toBe(201);
    expect(res.body.referralId).toBe(r.body.id);
    expect((await frontdesk.get(`/api/referrals/${r.body.id}`)).body.attachments.map((a: AttachmentSummary) => a.id)).toEqual([res.body.id]);
    // Once on a referral it stays there.
    const del = await frontdesk.delete(`/api/attachments/${res.body.id}`);
    expect(del.status).toBe(409);
  });

  it('serves the stored bytes to signed-in staff with the detected type, inline, and nosniff', async () => {
    const bytes = tinyPdf();
    const up = await upload(bytes, 'Esmé letter.pdf', 'image/png');
    for (const agent of [frontdesk, endodontist, manager]) {
      const res = await agent.get(`/api/attachments/${up.body.id}/content`).buffer(true).parse(binary);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      expect(res.headers['content-disposition']).toBe(`inline; filename="Esm_ letter.pdf"; filename*=UTF-8''Esm%C3%A9%20letter.pdf`);
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(Number(res.headers['content-length'])).toBe(bytes.length);
      expect(sha256(res.body as Buffer)).toBe(sha256(bytes));
    }
    expect((await assistant.get(`/api/attachments/${up.body.id}/content`)).status).toBe(403);
    expect((await t.http().get(`/api/attachments/${up.body.id}/content`)).status).toBe(401);
    expect((await frontdesk.get('/api/attachments/999999/content')).status).toBe(404);
  });

  it('deletes an upload not yet on a referral, with its file', async () => {
    const up = await upload(tinyPng(), 'mistake.png', 'image/png');
    const before = await stored();
    expect((await frontdesk.delete(`/api/attachments/${up.body.id}`)).status).toBe(204);
    expect((await stored()).length).toBe(before.length - 1);
    expect((await frontdesk.get(`/api/attachments/${up.body.id}/content`)).status).toBe(404);
  });

  it('lets only front desk and admin upload', async () => {
    for (const agent of [endodontist, manager, assistant]) {
      expect((await upload(tinyPng(), 'a.png', 'image/png', {}, agent)).status).toBe(403);
    }
  });
});
