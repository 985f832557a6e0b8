import { Injectable } from '@nestjs/common';
import type { LetterChannel, OpeningHours, PatientInput, PracticeSettings, Procedure, ReferralStatus, Role, Urgency } from '@ostium/shared';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { PatientsService } from '../patients/patients.service.js';
import { PracticesService } from '../practices/practices.service.js';
import { daysBefore, todayIn } from '../referrals/referral-dates.util.js';
import { STATUS_PATH } from '../referrals/referral-status.util.js';
import { parseReferralTeeth } from '../referrals/referral-teeth.util.js';
import { ReferralsService } from '../referrals/referrals.service.js';
import { ReferringDentistsService } from '../referring-dentists/referring-dentists.service.js';
import { DemoScheduleService } from '../scheduling/demo-schedule.service.js';
import { UsersService } from '../users/users.service.js';
import { DemoHistoryService } from './demo-history.service.js';

interface DemoPractice {
  practice: { name: string; phone?: string; email?: string; settings?: Partial<PracticeSettings> };
  locations: {
    name: string;
    address?: string;
    phone?: string;
    timeZone: string;
    openingHours: OpeningHours;
    microscopes: { name: string; mobile: boolean; fixedToChair?: string }[];
    chairs: string[];
  }[];
  demoPassword: string;
  users: { email: string; name: string; role: Role }[];
}

interface DemoReferrals {
  toothNotation: 'fdi' | 'universal';
  referringDentists: { name: string; practiceName?: string; email?: string | null; phone?: string; address?: string; letterChannel?: LetterChannel; notes?: string }[];
  patients: (PatientInput & { firstName: string; lastName: string })[];
  referrals: {
    patient: string;
    referringDentist: string;
    location: string;
    receivedDaysAgo: number;
    urgency: Urgency;
    procedure: Procedure;
    teeth: string[];
    reason?: string;
    notes?: string;
    status: ReferralStatus;
    statusReason?: string;
  }[];
}

// The seeds' status changes are the system's, not a user's.
const SEED_ACTOR = { id: null, name: 'Demo data' };
const DAY_MS = 24 * 3600 * 1000;

/** Loads the demo practice from seeds/ through the domain services; safe to run again. */
@Injectable()
export class SeedsService {
  constructor(
    private readonly practices: PracticesService,
    private readonly users: UsersService,
    private readonly patients: PatientsService,
    private readonly dentists: ReferringDentistsService,
    private readonly referrals: ReferralsService,
    private readonly schedule: DemoScheduleService,
    private readonly history: DemoHistoryService,
  ) {}

  /**
   * `history` also writes about four months of past visits before today (demo-history.service.ts), as
   * `npm run seed` and `npm start` do; the API tests load the demo without it, so their counts stay put.
   */
  async loadDemo({ ifEmpty = false, dir, history = false }: { ifEmpty?: boolean; dir?: string; history?: boolean } = {}): Promise<string> {
    if (ifEmpty && (await this.practices.count()) > 0) return 'database already holds a practice; nothing loaded';
    const seedsDir = dir ?? join(process.cwd(), 'seeds');
    const demo: DemoPractice = JSON.parse(await readFile(join(seedsDir, 'demo', 'practice.json'), 'utf8'));
    const practice = await this.practices.ensurePractice(demo.practice);
    let chairs = 0;
    const locations = new Map<string, { id: number; timeZone: string }>();
    for (const l of demo.locations) {
      const location = await this.practices.ensureLocation(practice.id, l);
      locations.set(l.name, { id: location.id, timeZone: location.timeZone });
      const fixed = new Map<string, number>();
      for (const m of l.microscopes) {
        const scope = await this.practices.ensureMicroscope(practice.id, location.id, m);
        if (m.fixedToChair) fixed.set(m.fixedToChair, scope.id);
      }
      for (const name of l.chairs) {
        await this.practices.ensureChair(practice.id, location.id, { name, fixedMicroscopeId: fixed.get(name) ?? null });
        chairs++;
      }
    }
    let created = 0;
    for (const u of demo.users) {
      if (await this.users.findByEmail(u.email)) continue;
      await this.users.create(practice.id, { ...u, password: demo.demoPassword });
      created++;
    }
    const intake = await this.loadReferrals(practice.id, seedsDir, locations);
    const schedule = await this.schedule.load(practice.id);
    const past = history ? await this.history.load(practice.id) : '';
    return `practice "${practice.name}", ${demo.locations.length} locations, ${chairs} chairs, ${created} new users${schedule}${past}${intake}`;
  }

  /**
   * Referring dentists, patients and referrals through their services, matched by natural key
   * (dentist name; patient name and date of birth; patient + dentist + first tooth) so a second run adds
   * nothing. No acknowledgement letters are sent for demo referrals.
   */
  private async loadReferrals(practiceId: number, seedsDir: string, locations: Map<string, { id: number; timeZone: string }>): Promise<string> {
    let data: DemoReferrals;
    try {
      data = JSON.parse(await readFile(join(seedsDir, 'demo', 'referrals.json'), 'utf8'));
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === 'ENOENT') return '';
      throw e;
    }
    const dentistIds = new Map<string, number>();
    let newDentists = 0;
    for (const d of data.referringDentists) {
      const found = await this.dentists.findByName(practiceId, d.name);
      const row = found ?? (await this.dentists.createRow(practiceId, d));
      if (!found) newDentists++;
      dentistIds.set(d.name, row.id);
    }
    const patientIds = new Map<string, number>();
    let newPatients = 0;
    for (const p of data.patients) {
      const [found] = await this.patients.sameNameAndBirth(practiceId, p);
      const id = found?.id ?? (await this.patients.createRow(practiceId, { ...p, confirmNew: true })).id;
      if (!found) newPatients++;
      patientIds.set(`${p.firstName} ${p.lastName}`, id);
    }
    let newReferrals = 0;
    const now = Date.now();
    for (const r of data.referrals) {
      const patientId = patientIds.get(r.patient);
      const referringDentistId = dentistIds.get(r.referringDentist);
      const location = locations.get(r.location);
      if (!patientId || !referringDentistId || !location) throw new Error(`demo referral for ${r.patient}: unknown patient, referring dentist or location`);
      const teeth = parseReferralTeeth(r.teeth.map((tooth) => ({ tooth })), data.toothNotation, r.procedure);
      if (teeth.errors.length) throw new Error(`demo referral for ${r.patient}: ${teeth.errors.map((e) => e.message).join('; ')}`);
      if (await this.referrals.findExisting(practiceId, patientId, referringDentistId, teeth.teeth[0]!.toothFdi)) continue;
      const receivedOn = daysBefore(todayIn(location.timeZone), r.receivedDaysAgo);
      // Received mid-morning at the location; each later step a day apart, never in the future.
      const receivedAt = Math.min(now, Date.parse(`${receivedOn}T15:00:00Z`));
      const referral = await this.referrals.create(
        practiceId,
        SEED_ACTOR,
        {
          patientId,
          referringDentistId,
          locationId: location.id,
          receivedOn,
          urgency: r.urgency,
          procedure: r.procedure,
          reason: r.reason ?? null,
          notes: r.notes ?? null,
          notation: data.toothNotation,
          teeth: r.teeth.map((tooth) => ({ tooth })),
        },
        { sendLetters: false, at: new Date(receivedAt) },
      );
      const steps = r.status === 'declined' || r.status === 'cancelled' ? [r.status] : STATUS_PATH.slice(1, STATUS_PATH.indexOf(r.status) + 1);
      let at = receivedAt;
      for (const status of steps) {
        at = Math.min(now, at + DAY_MS);
        await this.referrals.setStatus(practiceId, referral.id, status, { actor: SEED_ACTOR, reason: r.statusReason ?? null, at: new Date(at) });
      }
      newReferrals++;
    }
    return `, ${newDentists} new referring dentists, ${newPatients} new patients, ${newReferrals} new referrals`;
  }
}
