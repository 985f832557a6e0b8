import { Injectable } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import { DateTime } from 'luxon';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { EstimatesService } from '../estimates/estimates.service.js';
import { Location } from '../practices/models/location.model.js';
import type { Actor } from '../referrals/case-record.types.js';
import { ReferralsService } from '../referrals/referrals.service.js';
import { User } from '../users/models/user.model.js';
import { AppointmentsService } from './appointments.service.js';
import { LocationClosure } from './models/location-closure.model.js';
import { ResourcesService } from './resources.service.js';
import { TimeFinderService } from './time-finder.service.js';

interface DemoRule {
  location: string;
  rrule: string;
  start: string;
  end: string;
  breaks?: { start: string; end: string }[];
}

// The demo endodontists' weeks (invented): who works where, when, and the emergency block each keeps.
const DEMO_SCHEDULES: { email: string; rules: DemoRule[]; hold: DemoRule }[] = [
  {
    email: 'endo@quillfern-endo.test',
    rules: [{ location: 'Riverside', rrule: 'FREQ=WEEKLY;BYDAY=MO,WE,TH', start: '08:00', end: '16:30', breaks: [{ start: '12:00', end: '12:45' }] }],
    hold: { location: 'Riverside', rrule: 'FREQ=WEEKLY;BYDAY=MO,WE,TH', start: '15:45', end: '16:30' },
  },
  {
    email: 'endo2@quillfern-endo.test',
    rules: [
      { location: 'Riverside', rrule: 'FREQ=WEEKLY;BYDAY=TU', start: '08:00', end: '16:30', breaks: [{ start: '12:00', end: '12:45' }] },
      { location: 'Riverside', rrule: 'FREQ=WEEKLY;BYDAY=FR', start: '08:00', end: '14:00' },
      { location: 'Hilltop', rrule: 'FREQ=WEEKLY;BYDAY=MO,TH', start: '09:00', end: '17:30', breaks: [{ start: '12:30', end: '13:15' }] },
    ],
    hold: { location: 'Hilltop', rrule: 'FREQ=WEEKLY;BYDAY=MO,TH', start: '16:45', end: '17:30' },
  },
  {
    email: 'endo3@quillfern-endo.test',
    rules: [
      { location: 'Hilltop', rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,TH', start: '09:00', end: '18:00', breaks: [{ start: '13:00', end: '13:45' }] },
      { location: 'Hilltop', rrule: 'FREQ=WEEKLY;BYDAY=SA', start: '09:00', end: '13:00' },
    ],
    hold: { location: 'Hilltop', rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,TH', start: '17:15', end: '18:00' },
  },
];

// The demo cases' chart notes, so the booked ones carry an estimate as if the case sheet had been filled in.
const DEMO_ASSESSMENT = { canalVisibility: 'moderate' } as const;

const SEED_ACTOR: Actor = { id: null, name: 'Demo data' };

/** Working rules, holds, a closure and a few appointments for the demo practice; a second run adds nothing. */
@Injectable()
export class DemoScheduleService {
  constructor(
    private readonly sequelize: Sequelize,
    @InjectModel(User) private readonly users: typeof User,
    @InjectModel(Location) private readonly locations: typeof Location,
    @InjectModel(LocationClosure) private readonly closures: typeof LocationClosure,
    private readonly resources: ResourcesService,
    private readonly finder: TimeFinderService,
    private readonly appointments: AppointmentsService,
    private readonly referrals: ReferralsService,
    private readonly estimates: EstimatesService,
  ) {}

  async load(practiceId: number, now = Date.now()): Promise<string> {
    const locations = new Map((await this.locations.findAll({ where: { practiceId } })).map((l) => [l.name, l]));
    let rules = 0;
    for (const s of DEMO_SCHEDULES) {
      const op = await this.users.findOne({ where: { email: s.email, practiceId } });
      if (!op) continue;
      const schedule = await this.resources.getSchedule(practiceId, op.id);
      if (schedule.workingRules.length === 0) {
        for (const r of s.rules) {
          const loc = locations.get(r.location);
          if (!loc) continue;
          await this.resources.addWorkingRule(practiceId, op.id, { locationId: loc.id, rrule: r.rrule, start: r.start, end: r.end, breaks: r.breaks ?? [] });
          rules++;
        }
      }
      const holdLoc = locations.get(s.hold.location);
      if (schedule.holds.length === 0 && holdLoc) {
        await this.resources.addHold(practiceId, { operatorId: op.id, locationId: holdLoc.id, rrule: s.hold.rrule, start: s.hold.start, end: s.hold.end });
      }
    }

    // Riverside is shut on the coming 24 December (staff holiday), whatever year the demo runs in.
    const riverside = locations.get('Riverside');
    let closures = 0;
    if (riverside) {
      const today = DateTime.fromMillis(now, { zone: riverside.timeZone });
      let eve = today.set({ month: 12, day: 24 });
      if (eve < today.startOf('day')) eve = eve.plus({ years: 1 });
      const date = eve.toISODate()!;
      if (!(await this.closures.findOne({ where: { locationId: riverside.id, date } }))) {
        await this.resources.addClosure(practiceId, riverside.id, { date, reason: 'Staff holiday' });
        closures++;
      }
    }

    // Cases whose referral is already booked or in treatment get their appointments (through the booking guard).
    const cases = await this.sequelize.query<{ id: number }>(
      `SELECT c.id FROM cases c JOIN referrals r ON r.id = c.referral_id
        WHERE c.practice_id = :practiceId AND r.status IN ('booked', 'in_treatment')
          AND NOT EXISTS (SELECT 1 FROM appointments a WHERE a.case_id = c.id)
        ORDER BY c.id`,
      { replacements: { practiceId }, type: QueryTypes.SELECT },
    );
    let booked = 0;
    const tomorrow = DateTime.fromMillis(now, { zone: riverside?.timeZone ?? 'America/New_York' }).plus({ days: 1 }).startOf('day');
    for (const { id } of cases) {
      let c = await this.referrals.getCase(practiceId, id);
      if (!c.estimate) {
        const est = await this.estimates.estimateFor(practiceId, { toothFdi: c.toothFdi, procedure: c.procedure, assessment: DEMO_ASSESSMENT });
        c = await this.referrals.updateCase(practiceId, id, {
          estimate: est,
          tableVersion: est.tableVersion,
          level: est.level,
          estimatedMinutes: est.totalMinutes,
          visitCount: est.visits.length,
          canals: est.canals,
          assessment: est.assessment,
        });
      }
      const found = await this.finder.find(
        practiceId,
        { caseId: id, locationId: c.locationId, from: tomorrow.toUTC().toISO()!, to: tomorrow.plus({ days: 28 }).toUTC().toISO()!, limit: 1 },
        { now },
      );
      const proposal = found.proposals[0];
      if (!proposal) continue;
      const res = await this.appointments.book(practiceId, SEED_ACTOR, { caseId: id, visits: proposal.visits, notes: 'Demo booking' }, `demo-case-${id}`);
      booked += res.body.appointments.length;
    }
    return `, ${rules} working rules, ${closures} closures, ${booked} demo appointments`;
  }
}
