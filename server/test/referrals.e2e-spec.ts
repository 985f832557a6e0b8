import type { LocationSummary, Referral, ReferralListItem, ReferralQueuePage, ReferralStatus } from '@ostium/shared';
import { DateTime } from 'luxon';
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxDispatcherService } from '../src/messaging/outbox-dispatcher.service.js';
import { SeedsService } from '../src/seeds/seeds.service.js';
import { closedPort, SMTP_PORT, waitForMail } from './helpers/mail-inbox.js';
import { tinyPng } from './helpers/sample-files.js';
import { createTestApp, testConfig, type TestApp } from './helpers/test-app.js';

type Agent = Awaited<ReturnType<TestApp['as']>>;

const fieldsOf = (body: { errors?: { field: string }[] }) => (body.errors ?? []).map((e) => e.field).sort();
const cfg = testConfig();
const inbox = { ...cfg.mail, host: '127.0.0.1', port: SMTP_PORT };

let seq = 0;
// Unique, fictional names so each test finds its own rows (and its own mail) among the demo data.
const uniq = () => `${Date.now().toString(36)}${(++seq).toString(36)}`.replace(/\d/g, (d) => 'abcdefghij'[Number(d)]!);
const newPatient = (over: Record<string, unknown> = {}) => ({
  firstName: `Ivo${uniq()}`,
  lastName: `Pemberley${uniq()}`,
  dateOfBirth: '1980-05-14',
  phone: '(202) 555-0170',
  ...over,
});
const newDentist = (over: Record<string, unknown> = {}) => ({
  name: `Dr. Orla Fenwick-${uniq()}`,
  practiceName: `Greywater Dental ${uniq()}`,
  email: `orla.${uniq()}@greywater-dental.test`,
  phone: '202-555-0171',
  ...over,
});

// Both demo locations keep New York time; dates are counted on that calendar, as the server does.
const daysAgo = (n: number) => DateTime.now().setZone('America/New_York').minus({ days: n }).toISODate()!;

describe('referrals', () => {
  let t: TestApp;
  let frontdesk: Agent;
  let admin: Agent;
  let manager: Agent;
  let assistant: Agent;
  let endodontist: Agent;
  let riverside: LocationSummary;
  let hilltop: LocationSummary;

  beforeAll(async () => {
    t = await createTestApp({ mail: inbox, uploadDir: await mkdtemp(join(tmpdir(), 'ostium-uploads-')) });
    [frontdesk, admin, manager, assistant, endodontist] = await Promise.all([t.as('frontdesk'), t.as('admin'), t.as('manager'), t.as('assistant'), t.as('endodontist')]);
    const locations: LocationSummary[] = (await admin.get('/api/locations')).body;
    riverside = locations.find((l) => l.name === 'Riverside')!;
    hilltop = locations.find((l) => l.name === 'Hilltop')!;
  });
  afterAll(async () => t?.close());

  const base = (over: Record<string, unknown> = {}) => ({
    patient: newPatient(),
    referringDentist: newDentist(),
    locationId: riverside.id,
    urgency: 'routine',
    procedure: 'initial',
    teeth: [{ tooth: '19' }],
    ...over,
  });

  async function create(body: Record<string, unknown>, agent: Agent = frontdesk): Promise<Referral> {
    const res = await agent.post('/api/referrals').send(body);
    if (res.status !== 201) throw new Error(`create referral: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body;
  }

  describe('intake', () => {
    it('saves a referral with a new patient and referring dentist, one case per tooth, and answers the full referral', async () => {
      const patient = newPatient({ phone: '202 555 0172' });
      const dentist = newDentist();
      const res = await frontdesk.post('/api/referrals').send(
        base({ patient, referringDentist: dentist, urgency: 'soon', procedure: 'retreatment', reason: 'Tender after an earlier treatment', teeth: [{ tooth: '19' }, { tooth: '3', procedure: 'initial' }] }),
      );
      expect(res.status).toBe(201);
      const r: Referral = res.body;
      expect(r).toMatchObject({
        status: 'received',
        urgency: 'soon',
        procedure: 'retreatment',
        reason: 'Tender after an earlier treatment',
        notes: null,
        statusReason: null,
        location: { id: riverside.id, name: 'Riverside' },
        patient: { name: `${patient.firstName} ${patient.lastName}`, dateOfBirth: '1980-05-14' },
        referringDentist: { name: dentist.name, practiceName: dentist.practiceName },
        waitingDays: 0,
      });
      // The practice shows Universal; stored FDI (ISO 3950 / HL7 crosswalk, references.md: 19→36, 3→16).
      expect(r.teeth).toEqual(['36', '16']);
      expect(r.cases.map((c) => [c.toothFdi, c.procedure, c.status])).toEqual([
        ['36', 'retreatment', 'received'],
        ['16', 'initial', 'received'],
      ]);
      expect(r.cases.every((c) => c.referralId === r.id && c.level === null && c.estimatedMinutes === null && c.visitCount === null)).toBe(true);
      expect(r.patientDetail).toMatchObject({ firstName: patient.firstName, phone: '+12025550172', timeZone: riverside.timeZone, smsConsent: false });
      expect(r.referringDentistDetail).toMatchObject({ name: dentist.name, email: dentist.email, phone: '+12025550171', letterChannel: 'email', referralCount: 1 });
      expect(r.history).toHaveLength(1);
      expect(r.history[0]).toMatchObject({ status: 'received', reason: null, byName: 'Mirela Okonkwo-Hale' });
      expect(r.history[0]!.byUserId).toEqual(expect.any(Number));
      expect(r.attachments).toEqual([]);
      // receivedOn defaults to today at the location.
      expect(r.receivedOn).toBe(daysAgo(0));

      const again = await frontdesk.get(`/api/referrals/${r.id}`);
      expect(again.status).toBe(200);
      expect(again.body).toEqual({ ...r, letters: again.body.letters });
    });

    it('reads teeth in the notation given, or the practice setting (Universal), for permanent and primary teeth', async () => {
      // ISO 3950 / HL7 crosswalk checks (references.md, verified): 8→11, 9→21, 30→46, 32→48, A→55, K→75, T→85.
      const universal = await create(base({ teeth: ['8', '9', '30', '32', 'A', 'K', 'T'].map((tooth) => ({ tooth })) }));
      expect(universal.teeth).toEqual(['11', '21', '46', '48', '55', '75', '85']);
      const fdi = await create(base({ notation: 'fdi', teeth: [{ tooth: '36' }, { tooth: '85' }] }));
      expect(fdi.teeth).toEqual(['36', '85']);
      const hash = await create(base({ notation: 'universal', teeth: [{ tooth: '#19' }] }));
      expect(hash.teeth).toEqual(['36']);
    });

    it('uses an existing patient and referring dentist by id, and fills a missing patient time zone from the location', async () => {
      const p = await frontdesk.post('/api/patients').send(newPatient());
      expect(p.status).toBe(201);
      expect(p.body.timeZone).toBeNull();
      const d = await frontdesk.post('/api/referring-dentists').send(newDentist());
      const r = await create({ ...base(), patient: undefined, referringDentist: undefined, patientId: p.body.id, referringDentistId: d.body.id, locationId: hilltop.id });
      expect(r.patient.id).toBe(p.body.id);
      expect(r.referringDentist.id).toBe(d.body.id);
      expect(r.patientDetail.timeZone).toBe(hilltop.timeZone);
    });

    it('names every bad field of an empty or wrong request', async () => {
      const empty = await frontdesk.post('/api/referrals').send({});
      expect(empty.status).toBe(400);
      expect(fieldsOf(empty.body)).toEqual(expect.arrayContaining(['locationId', 'procedure', 'teeth', 'urgency']));

      const wrong = await frontdesk.post('/api/referrals').send({
        ...base(),
        urgency: 'asap',
        procedure: 'whitening',
        receivedOn: '2026-02-30',
        notation: 'palmer',
        teeth: [],
        attachmentIds: ['x'],
        colour: 'teal',
      });
      expect(wrong.status).toBe(400);
      expect(fieldsOf(wrong.body)).toEqual(['attachmentIds', 'colour', 'notation', 'procedure', 'receivedOn', 'teeth', 'urgency']);
      expect(wrong.body.errors.find((e: { field: string }) => e.field === 'teeth').message).toBe('teeth must list at least one tooth');
      expect(wrong.body.errors.find((e: { field: string }) => e.field === 'colour').message).toBe('colour is not a known field');
    });

    it('names the fields of an inline patient and referring dentist', async () => {
      const res = await frontdesk.post('/api/referrals').send(
        base({
          patient: { firstName: ' ', lastName: 'Quell', dateOfBirth: '1984-13-01', phone: 'call me', email: 'not-mail', preferredChannel: 'pigeon' },
          referringDentist: { name: '', email: 'nope', phone: '555', letterChannel: 'telex' },
        }),
      );
      expect(res.status).toBe(400);
      expect(fieldsOf(res.body)).toEqual([
        'patient.dateOfBirth',
        'patient.email',
        'patient.firstName',
        'patient.phone',
        'patient.preferredChannel',
        'referringDentist.email',
        'referringDentist.letterChannel',
        'referringDentist.name',
        'referringDentist.phone',
      ]);
    });

    it('refuses a tooth that is not one in the notation, naming teeth.N.tooth', async () => {
      const res = await frontdesk.post('/api/referrals').send(base({ teeth: [{ tooth: '19' }, { tooth: '33' }, { tooth: 'U' }] }));
      expect(res.status).toBe(400);
      expect(fieldsOf(res.body)).toEqual(['teeth.1.tooth', 'teeth.2.tooth']);
      expect(res.body.errors[0].message).toMatch(/not a Universal tooth number/);
      const fdi = await frontdesk.post('/api/referrals').send(base({ notation: 'fdi', teeth: [{ tooth: '19' }] }));
      expect(fieldsOf(fdi.body)).toEqual(['teeth.0.tooth']);
    });

    it('refuses the same tooth twice in one referral, naming the second one', async () => {
      const res = await frontdesk.post('/api/referrals').send(base({ teeth: [{ tooth: '19' }, { tooth: '3' }, { tooth: '#19' }] }));
      expect(res.status).toBe(400);
      expect(res.body.errors).toEqual([{ field: 'teeth.2.tooth', message: expect.stringMatching(/listed twice/) }]);
    });

    it('needs a patient and a referring dentist (existing or new), not both, and ids that exist', async () => {
      const none = await frontdesk.post('/api/referrals').send({ ...base(), patient: undefined, referringDentist: undefined });
      expect(none.status).toBe(400);
      expect(fieldsOf(none.body)).toEqual(['patient', 'referringDentist']);
      const both = await frontdesk.post('/api/referrals').send({ ...base(), patientId: 1, referringDentistId: 1 });
      expect(fieldsOf(both.body)).toEqual(['patient', 'referringDentist']);
      const missing = await frontdesk.post('/api/referrals').send({ ...base(), patient: undefined, patientId: 999999 });
      expect(missing.status).toBe(400);
      expect(fieldsOf(missing.body)).toEqual(['patientId']);
      const noDentist = await frontdesk.post('/api/referrals').send({ ...base(), referringDentist: undefined, referringDentistId: 999999 });
      expect(fieldsOf(noDentist.body)).toEqual(['referringDentistId']);
      const noLocation = await frontdesk.post('/api/referrals').send(base({ locationId: 999999 }));
      expect(noLocation.status).toBe(400);
      expect(fieldsOf(noLocation.body)).toEqual(['locationId']);
    });

    it('refuses a received date in the future, and saves nothing of a refused referral', async () => {
      const patient = newPatient();
      const future = daysAgo(-3);
      const res = await frontdesk.post('/api/referrals').send(base({ patient, receivedOn: future }));
      expect(res.status).toBe(400);
      expect(fieldsOf(res.body)).toEqual(['receivedOn']);
      const found = await frontdesk.get(`/api/patients?q=${encodeURIComponent(patient.lastName)}`);
      expect(found.body).toEqual([]);
    });

    it('warns of a patient with the same name and date of birth (409 with the existing record), and accepts it with confirmNew', async () => {
      const patient = newPatient();
      const first = await create(base({ patient }));
      const before: ReferralQueuePage = (await frontdesk.get('/api/referrals?pageSize=1')).body;
      const dentist = newDentist();
      const twin = { ...patient, firstName: patient.firstName.toUpperCase(), lastName: ` ${patient.lastName.toLowerCase()} `, phone: null };
      const dup = await frontdesk.post('/api/referrals').send(base({ patient: twin, referringDentist: dentist }));
      expect(dup.status).toBe(409);
      expect(dup.body).toEqual({ statusCode: 409, message: expect.stringMatching(/already exists.*confirmNew/), existing: [first.patientDetail] });
      // Nothing of the refused referral was kept, not even its new referring dentist.
      const after: ReferralQueuePage = (await frontdesk.get('/api/referrals?pageSize=1')).body;
      expect(after.total).toBe(before.total);
      expect((await frontdesk.get(`/api/referring-dentists?q=${encodeURIComponent(dentist.name)}`)).body).toEqual([]);

      const confirmed = await create(base({ patient: { ...twin, confirmNew: true }, referringDentist: dentist }));
      expect(confirmed.patient.id).not.toBe(first.patient.id);
      // The demo data's patients are found too (Wren Halloway, 1984-03-17, seeds/demo/referrals.json).
      const demo = await frontdesk.post('/api/referrals').send(base({ patient: { firstName: 'wren', lastName: 'HALLOWAY', dateOfBirth: '1984-03-17' } }));
      expect(demo.status).toBe(409);
      expect(demo.body.existing.map((p: { firstName: string }) => p.firstName)).toEqual(['Wren']);
    });
  });

  describe('acknowledgement letter', () => {
    it('e-mails the referring dentist the patient’s name and that the referral arrived, nothing clinical, and logs it as sent', async () => {
      const patient = newPatient({ dateOfBirth: '1977-08-09' });
      const dentist = newDentist();
      const r = await create(base({ patient, referringDentist: dentist, procedure: 'retreatment', urgency: 'urgent', reason: 'Fistula buccal to the mesial root', notes: 'Anxious patient', teeth: [{ tooth: '32' }] }));
      // Queued in the outbox with the referral; the outbox job sends it (off in tests: drained here).
      expect(r.letters).toEqual([
        { id: expect.any(Number), kind: 'acknowledgement', to: dentist.email, subject: 'Referral received – Quillfern Endodontics', status: 'queued', detail: null, at: expect.any(String), sentAt: null },
      ]);
      await t.app.get(OutboxDispatcherService).drainOnce();
      expect((await frontdesk.get(`/api/referrals/${r.id}`)).body.letters).toEqual([{ ...r.letters[0], status: 'sent', sentAt: expect.any(String) }]);
      const name = `${patient.firstName} ${patient.lastName}`;
      const mail = await waitForMail((m) => !!m.text?.includes(name));
      expect(mail, 'the acknowledgement reached the local inbox').not.toBeNull();
      expect(mail!.to.map((a) => a.address)).toEqual([dentist.email]);
      expect(mail!.subject).toBe('Referral received – Quillfern Endodontics');
      expect(mail!.text).toContain(dentist.name);
      expect(mail!.text).toContain('Quillfern Endodontics');
      // Minimum necessary (45 CFR 164.502(b), references.md): no tooth, procedure, urgency, birth date or notes.
      // Universal 32 is FDI 48 (ISO 3950 / HL7 crosswalk, references.md); neither can be a day of the month.
      for (const leak of ['32', '48', 'retreatment', 'urgent', 'Fistula', 'Anxious', '1977', 'mesial']) {
        expect(mail!.text, `letter must not mention ${leak}`).not.toContain(leak);
        expect(mail!.html ?? '', `letter must not mention ${leak}`).not.toContain(leak);
      }
    });

    it('skips the e-mail, with the reason logged, when the referring dentist has no address or prefers another way', async () => {
      const noMail = await create(base({ referringDentist: newDentist({ email: null }) }));
      expect(noMail.letters).toEqual([expect.objectContaining({ kind: 'acknowledgement', status: 'skipped', detail: 'no e-mail address on file for the referring dentist' })]);
      const fax = await create(base({ referringDentist: newDentist({ letterChannel: 'fax' }) }));
      expect(fax.letters).toEqual([expect.objectContaining({ status: 'skipped', detail: expect.stringMatching(/prefers letters by fax/) })]);
    });
  });

  describe('attachments on the referral', () => {
    async function upload(name = 'bitewing.png'): Promise<number> {
      const res = await frontdesk.post('/api/attachments').attach('file', tinyPng(), { filename: name, contentType: 'image/png' });
      expect(res.status).toBe(201);
      return res.body.id;
    }

    it('links uploads made before the referral was saved', async () => {
      const a = await upload('pa-36.png');
      const b = await upload('pa-37.png');
      const r = await create(base({ attachmentIds: [a, b] }));
      expect(r.attachments.map((x) => [x.id, x.referralId, x.fileName, x.mimeType, x.kind])).toEqual([
        [a, r.id, 'pa-36.png', 'image/png', 'radiograph'],
        [b, r.id, 'pa-37.png', 'image/png', 'radiograph'],
      ]);
    });

    it('refuses an attachment that is on another referral or does not exist, and keeps nothing of the new referral', async () => {
      const a = await upload();
      await create(base({ attachmentIds: [a] }));
      const patient = newPatient();
      const res = await frontdesk.post('/api/referrals').send(base({ patient, attachmentIds: [999999, a] }));
      expect(res.status).toBe(400);
      expect(fieldsOf(res.body)).toEqual(['attachmentIds.0', 'attachmentIds.1']);
      expect((await frontdesk.get(`/api/patients?q=${encodeURIComponent(patient.lastName)}`)).body).toEqual([]);
    });
  });

  describe('queue', () => {
    // A referring dentist of its own keeps these checks exact whatever else is in the database.
    let dentistId: number;
    const made: Record<string, Referral> = {};

    beforeAll(async () => {
      const d = await frontdesk.post('/api/referring-dentists').send(newDentist({ email: null }));
      dentistId = d.body.id;
      const specs: [string, number, string, string, number][] = [
        // key, days ago, urgency, last name, location
        ['old', 20, 'routine', 'Aldermoor', riverside.id],
        ['mid', 10, 'urgent', 'Bellweather', hilltop.id],
        ['new', 2, 'soon', 'Cobblestone', riverside.id],
        ['today', 0, 'urgent', 'Dunnock', riverside.id],
        ['closed', 25, 'routine', 'Esterhazy', hilltop.id],
      ];
      for (const [key, ago, urgency, lastName, locationId] of specs) {
        made[key] = await create({
          ...base(),
          referringDentist: undefined,
          referringDentistId: dentistId,
          patient: newPatient({ lastName: `${lastName}${uniq()}` }),
          receivedOn: daysAgo(ago),
          urgency,
          locationId,
        });
      }
      for (const s of ['triaged', 'planned']) await frontdesk.patch(`/api/referrals/${made.mid!.id}/status`).send({ status: s });
      await frontdesk.patch(`/api/referrals/${made.closed!.id}/status`).send({ status: 'declined', reason: 'Outside the practice’s scope' });
    });

    const page = async (query: string): Promise<ReferralQueuePage> => {
      const res = await frontdesk.get(`/api/referrals?referringDentistId=${dentistId}${query}`);
      expect(res.status).toBe(200);
      return res.body;
    };
    const ids = (p: ReferralQueuePage) => p.items.map((i) => i.id);
    const keys = (...k: string[]) => k.map((x) => made[x]!.id);

    it('puts the open referral waiting longest first by default, closed ones after', async () => {
      const p = await page('');
      expect(ids(p)).toEqual(keys('old', 'mid', 'new', 'today', 'closed'));
      expect(p.total).toBe(5);
      expect(p.page).toBe(1);
      expect(p.pageSize).toBe(25);
      const old = p.items[0]!;
      expect(old.waitingDays).toBeGreaterThanOrEqual(19);
      expect(old.waitingDays).toBeLessThanOrEqual(21);
      expect(Object.keys(old).sort()).toEqual(['id', 'location', 'patient', 'procedure', 'receivedOn', 'referringDentist', 'status', 'teeth', 'urgency', 'waitingDays']);
      expect(old.teeth).toEqual(['36']);
    });

    it('counts per status under the other filters, whatever the status filter', async () => {
      const counts = { received: 3, triaged: 0, planned: 1, booked: 0, in_treatment: 0, completed: 0, report_sent: 0, declined: 1, cancelled: 0 };
      expect((await page('')).countsByStatus).toEqual(counts);
      expect((await page('&status=declined')).countsByStatus).toEqual(counts);
      expect((await page(`&locationId=${hilltop.id}`)).countsByStatus).toEqual({ ...counts, received: 0 });
    });

    it('filters by one or several statuses, urgency, location, dates and patient name', async () => {
      expect(ids(await page('&status=received'))).toEqual(keys('old', 'new', 'today'));
      expect(ids(await page('&status=planned&status=declined'))).toEqual(keys('mid', 'closed'));
      expect(ids(await page('&status=planned,declined'))).toEqual(keys('mid', 'closed'));
      expect(ids(await page('&urgency=urgent'))).toEqual(keys('mid', 'today'));
      expect(ids(await page(`&locationId=${hilltop.id}`))).toEqual(keys('mid', 'closed'));
      expect(ids(await page(`&from=${daysAgo(10)}&to=${daysAgo(2)}`))).toEqual(keys('mid', 'new'));
      expect(ids(await page(`&from=${daysAgo(1)}`))).toEqual(keys('today'));
      const name = made.new!.patient.name;
      expect(ids(await page(`&q=${encodeURIComponent(name.split(' ')[1]!.slice(0, 8))}`))).toEqual(keys('new'));
      expect(ids(await page(`&q=${encodeURIComponent(name.toLowerCase())}`))).toEqual(keys('new'));
      expect((await page('&q=nobody-by-this-name')).total).toBe(0);
    });

    it('sorts by received date, urgency or patient, either way', async () => {
      expect(ids(await page('&sort=received'))).toEqual(keys('today', 'new', 'mid', 'old', 'closed'));
      expect(ids(await page('&sort=received&order=asc'))).toEqual(keys('closed', 'old', 'mid', 'new', 'today'));
      expect(ids(await page('&sort=urgency'))).toEqual(keys('mid', 'today', 'new', 'closed', 'old'));
      expect(ids(await page('&sort=patient'))).toEqual(keys('old', 'mid', 'new', 'today', 'closed'));
      expect(ids(await page('&sort=patient&order=desc'))).toEqual(keys('closed', 'today', 'new', 'mid', 'old'));
      expect(ids(await page('&order=desc'))).toEqual(keys('today', 'new', 'mid', 'old', 'closed'));
    });

    it('pages', async () => {
      const p2 = await page('&pageSize=2&page=2');
      expect(ids(p2)).toEqual(keys('new', 'today'));
      expect(p2).toMatchObject({ total: 5, page: 2, pageSize: 2 });
      expect((await page('&pageSize=2&page=4')).items).toEqual([]);
    });

    it('names a bad query parameter', async () => {
      for (const [q, field] of [
        ['status=lost', 'status'],
        ['urgency=asap', 'urgency'],
        ['sort=colour', 'sort'],
        ['order=up', 'order'],
        ['page=0', 'page'],
        ['pageSize=500', 'pageSize'],
        ['from=2026-02-30', 'from'],
        ['locationId=x', 'locationId'],
      ]) {
        const res = await frontdesk.get(`/api/referrals?${q}`);
        expect(res.status, q).toBe(400);
        expect([...new Set(fieldsOf(res.body))], q).toEqual([field]);
      }
      const reversed = await frontdesk.get(`/api/referrals?from=${daysAgo(1)}&to=${daysAgo(5)}`);
      expect(fieldsOf(reversed.body)).toEqual(['from']);
    });

    it('holds the demo data’s referrals across their statuses', async () => {
      const all: ReferralQueuePage = (await frontdesk.get('/api/referrals?pageSize=100')).body;
      const counts = all.countsByStatus;
      for (const s of ['received', 'triaged', 'planned', 'booked', 'in_treatment', 'completed', 'report_sent', 'declined', 'cancelled'] as ReferralStatus[]) {
        expect(counts[s], s).toBeGreaterThan(0);
      }
      const wren = all.items.find((i: ReferralListItem) => i.patient.name === 'Wren Halloway')!;
      expect(wren).toMatchObject({ teeth: ['47'], procedure: 'retreatment', status: 'triaged' });
      const tobias = all.items.find((i: ReferralListItem) => i.patient.name === 'Tobias Ellery-Marsh' && i.status === 'received')!;
      expect(tobias).toMatchObject({ teeth: ['11'], procedure: 'initial' });
      // Demo referrals are not acknowledged: seeding sends no mail.
      const detail: Referral = (await frontdesk.get(`/api/referrals/${wren.id}`)).body;
      expect(detail.letters).toEqual([]);
      expect(detail.history.map((h) => [h.status, h.byName, h.byUserId])).toEqual([
        ['received', 'Demo data', null],
        ['triaged', 'Demo data', null],
      ]);
    });

    it('loads the demo data again without adding anything', async () => {
      const before: ReferralQueuePage = (await frontdesk.get('/api/referrals?pageSize=1')).body;
      const summary = await t.app.get(SeedsService).loadDemo({ dir: t.config.seedsDir ?? undefined });
      expect(summary).toMatch(/0 new referring dentists, 0 new patients, 0 new referrals$/);
      const after: ReferralQueuePage = (await frontdesk.get('/api/referrals?pageSize=1')).body;
      expect(after.total).toBe(before.total);
    });
  });

  describe('status', () => {
    it('moves one step at a time and records who and when', async () => {
      const r = await create(base({ teeth: [{ tooth: '19' }, { tooth: '20' }] }));
      const before = Date.now();
      const res = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' });
      expect(res.status).toBe(200);
      expect(res.body.status).toBe('triaged');
      expect(res.body.cases.map((c: { status: string }) => c.status)).toEqual(['triaged', 'triaged']);
      expect(res.body.history.map((h: { status: string }) => h.status)).toEqual(['received', 'triaged']);
      const ev = res.body.history[1];
      expect(ev).toMatchObject({ status: 'triaged', reason: null, byName: 'Mirela Okonkwo-Hale' });
      expect(Date.parse(ev.at)).toBeGreaterThanOrEqual(before - 1000);
      let last = res.body;
      for (const s of ['planned', 'booked', 'in_treatment', 'completed', 'report_sent']) {
        const step = await admin.patch(`/api/referrals/${r.id}/status`).send({ status: s });
        expect(step.status, s).toBe(200);
        last = step.body;
      }
      expect(last.history.map((h: { status: string }) => h.status)).toEqual(['received', 'triaged', 'planned', 'booked', 'in_treatment', 'completed', 'report_sent']);
      expect(last.history.at(-1).byName).toBe('Rowan Ashdown');
      const after = await admin.patch(`/api/referrals/${r.id}/status`).send({ status: 'cancelled', reason: 'too late' });
      expect(after.status).toBe(409);
      expect(after.body.message).toBe('A referral that is report sent can no longer be cancelled');
    });

    it('refuses skipping a step or going back, saying what the next step is', async () => {
      const r = await create(base());
      const skip = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'booked' });
      expect(skip.status).toBe(409);
      expect(skip.body).toEqual({
        statusCode: 409,
        message: 'A referral that is received cannot change to booked; the next step is triaged (or declined / cancelled with a reason)',
        errors: [{ field: 'status', message: expect.any(String) }],
      });
      await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' });
      const back = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'received' });
      expect(back.status).toBe(409);
      const same = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' });
      expect(same.status).toBe(409);
      expect(same.body.message).toBe('The referral is already triaged');
    });

    it('declines or cancels an open referral only with a reason, and nothing follows a closed one', async () => {
      const r = await create(base());
      const noReason = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'declined', reason: '  ' });
      expect(noReason.status).toBe(400);
      expect(fieldsOf(noReason.body)).toEqual(['reason']);
      const declined = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'declined', reason: ' Referred to oral surgery instead ' });
      expect(declined.status).toBe(200);
      expect(declined.body).toMatchObject({ status: 'declined', statusReason: 'Referred to oral surgery instead' });
      expect(declined.body.cases.map((c: { status: string }) => c.status)).toEqual(['declined']);
      expect(declined.body.history.at(-1)).toMatchObject({ status: 'declined', reason: 'Referred to oral surgery instead' });
      const reopen = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' });
      expect(reopen.status).toBe(409);

      const booked = await create(base());
      for (const s of ['triaged', 'planned', 'booked']) await frontdesk.patch(`/api/referrals/${booked.id}/status`).send({ status: s });
      const cancelled = await frontdesk.patch(`/api/referrals/${booked.id}/status`).send({ status: 'cancelled', reason: 'Patient moved away' });
      expect(cancelled.body).toMatchObject({ status: 'cancelled', statusReason: 'Patient moved away' });
    });

    it('names a bad status and answers 404 for a referral that does not exist', async () => {
      const r = await create(base());
      const bad = await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'lost' });
      expect(bad.status).toBe(400);
      expect(fieldsOf(bad.body)).toEqual(['status']);
      expect((await frontdesk.patch('/api/referrals/999999/status').send({ status: 'triaged' })).status).toBe(404);
      expect((await frontdesk.get('/api/referrals/999999')).status).toBe(404);
    });

    it('records status changes in the audit log', async () => {
      const r = await create(base());
      await frontdesk.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' });
      const audit = await admin.get(`/api/audit?entity=referrals&entityId=${r.id}`);
      const actions = audit.body.items.map((e: { action: string; after: { status?: string } | null }) => [e.action, e.after?.status]);
      expect(actions).toEqual(expect.arrayContaining([['create', 'received'], ['update', 'triaged']]));
    });
  });

  describe('who may do what', () => {
    it('keeps the queue and referrals from the assistant', async () => {
      const r = await create(base());
      for (const url of ['/api/referrals', `/api/referrals/${r.id}`]) {
        const res = await assistant.get(url);
        expect(res.status, url).toBe(403);
        expect(res.body).toEqual({ statusCode: 403, message: 'The assistant role cannot do this' });
      }
    });

    it('lets the manager and the endodontist read but not write', async () => {
      const r = await create(base());
      for (const agent of [manager, endodontist]) {
        expect((await agent.get('/api/referrals')).status).toBe(200);
        expect((await agent.get(`/api/referrals/${r.id}`)).status).toBe(200);
        const post = await agent.post('/api/referrals').send(base());
        expect(post.status).toBe(403);
        expect((await agent.patch(`/api/referrals/${r.id}/status`).send({ status: 'triaged' })).status).toBe(403);
      }
      expect((await frontdesk.get(`/api/referrals/${r.id}`)).body.status).toBe('received');
    });

    it('lets the admin take a referral', async () => {
      expect((await admin.post('/api/referrals').send(base())).status).toBe(201);
    });
  });
});

describe('referrals when the mail server is down', () => {
  let t: TestApp;
  let frontdesk: Agent;
  let port: number;

  beforeAll(async () => {
    port = await closedPort();
    // One attempt, so the refused connection ends the letter failed at the first pass of the outbox.
    t = await createTestApp({ mail: { ...cfg.mail, host: '127.0.0.1', port }, messaging: { maxAttempts: 1 }, uploadDir: await mkdtemp(join(tmpdir(), 'ostium-uploads-')) });
    frontdesk = await t.as('frontdesk');
  });
  afterAll(async () => t?.close());

  it('still saves the referral and logs the acknowledgement as failed with the reason', async () => {
    const locations: LocationSummary[] = (await frontdesk.get('/api/locations')).body;
    const res = await frontdesk.post('/api/referrals').send({
      patient: newPatient(),
      referringDentist: newDentist(),
      locationId: locations[0]!.id,
      urgency: 'routine',
      procedure: 'initial',
      teeth: [{ tooth: '30' }],
    });
    expect(res.status).toBe(201);
    expect(res.body.teeth).toEqual(['46']); // Universal 30 → FDI 46 (ISO 3950 / HL7 crosswalk, references.md)
    expect(res.body.letters).toEqual([expect.objectContaining({ kind: 'acknowledgement', status: 'queued' })]);
    await t.app.get(OutboxDispatcherService).drainOnce();
    const again = await frontdesk.get(`/api/referrals/${res.body.id}`);
    expect(again.status).toBe(200);
    expect(again.body.letters).toEqual([
      expect.objectContaining({ kind: 'acknowledgement', status: 'failed', detail: `the mail server at 127.0.0.1:${port} refused the connection (gave up after 1 attempts)` }),
    ]);
  });
});
