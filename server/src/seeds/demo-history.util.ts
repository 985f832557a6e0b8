// The demo practice's past months, generated (seeded PRNG, so the same seed and day give the same data):
// the endodontists' working days filled with visits, each booked at the table's length at first and at
// the calibrated length once the practice has learned from its visits, then seated and dismissed with
// realistic variance (a slow endodontist and hard molars run long, delays cascade, some days run past
// closing), about 5 % no-shows, late and early cancellations, same-day fills, confirmations by text,
// link and desk after reminders that were sent, and the referrals behind every case. Pure: no Nest, no
// database; demo-history.service.ts writes the result. Every person is invented.
import type { CompletedVisit, EstimateResult, EstimateTable, Level, OpeningHours, Procedure, ReferralStatus, ToothGroup, Urgency } from '@ostium/shared';
import { bookedMinutes, calibrationFor, estimate, learnCalibration, calibrationOptions, type CalibrationModel } from '../estimates/estimator/index.js';
import { mulberry32, normal } from '../estimates/estimator/seeded-random.util.js';
import { expandRuleDays } from '../scheduling/time-finder/recurrence.util.js';
import { intersectIntervals } from '../scheduling/time-finder/interval.util.js';
import type { Interval } from '../scheduling/time-finder/time-finder.types.js';
import { clockFor, closedDays, DAY_MS, formatLocalDate, MINUTE_MS, openOnDay, wallRangeOnDay, type LocalDay, type ReportWorkingRule, type ZoneClock } from '../reports/report-time.util.js';

const PATIENT_AREA_CODES = ['212', '303', '312', '404', '415', '503', '617', '702', '718', '808'];

const HOUR = 3_600_000;
const GRID = 5 * MINUTE_MS;

export interface HistoryLocation {
  id: number;
  name: string;
  timeZone: string;
  openingHours: OpeningHours;
  closures: readonly string[];
}
export interface HistoryChair {
  id: number;
  locationId: number;
  fixedMicroscopeId: number | null;
}
export interface HistoryMicroscope {
  id: number;
  locationId: number;
  mobile: boolean;
}
export interface HistoryOperator {
  id: number;
  /** Actual ÷ table minutes of this endodontist's visits (the hidden truth the calibration learns). */
  pace: number;
  rules: readonly ReportWorkingRule[];
}

export interface HistoryInput {
  /** Seed time: the history ends the local day before. */
  now: number;
  weeks: number;
  seed: number;
  practiceName: string;
  table: EstimateTable;
  locations: readonly HistoryLocation[];
  chairs: readonly HistoryChair[];
  microscopes: readonly HistoryMicroscope[];
  operators: readonly HistoryOperator[];
  /** Chance that the operator leaves 15–45 minutes idle before the next visit (default 0.15). */
  idleShare?: number;
  /** Referring dentists in order of how often they refer. */
  dentistIds: readonly number[];
  /** The visit history's yardstick: table minutes of one visit of this case at this level. */
  tableMinutes: (toothFdi: string, procedure: Procedure, canals: number, level: Level) => number;
}

export interface HistoryPatient {
  firstName: string;
  lastName: string;
  dateOfBirth: string;
  phone: string;
  email: string;
  smsConsent: boolean;
}
export interface HistoryReferral {
  patient: number;
  dentistId: number;
  locationId: number;
  receivedOn: string;
  urgency: Urgency;
  procedure: Procedure;
  status: ReferralStatus;
  statusReason: string | null;
  events: { status: ReferralStatus; at: number; reason: string | null }[];
}
export interface HistoryCase {
  referral: number;
  toothFdi: string;
  procedure: Procedure;
  status: ReferralStatus;
  estimate: EstimateResult | null;
  operatorId: number | null;
}
export interface HistoryAppointment {
  case: number;
  visitIndex: number;
  locationId: number;
  chairId: number;
  operatorId: number;
  microscopeId: number | null;
  start: number;
  end: number;
  turnoverMinutes: number;
  state: 'dismissed' | 'cancelled' | 'no_show';
  createdAt: number;
  confirmedAt: number | null;
  confirmedVia: 'sms' | 'link' | 'desk' | null;
  cancelledAt: number | null;
  cancelNoticeHours: number | null;
  cancelReason: string | null;
  seatedAt: number | null;
  dismissedAt: number | null;
}
export interface HistoryReminder {
  appointment: number;
  ruleId: 'text-48h' | 'text-24h';
  sentAt: number;
}
export interface HistoryVisit {
  appointment: number;
  visitDate: string;
  toothFdi: string;
  procedure: Procedure;
  toothGroup: ToothGroup;
  canals: number;
  level: Level;
  operatorId: number;
  estimatedMinutes: number;
  actualMinutes: number;
}
export interface History {
  patients: HistoryPatient[];
  referrals: HistoryReferral[];
  cases: HistoryCase[];
  appointments: HistoryAppointment[];
  reminders: HistoryReminder[];
  visits: HistoryVisit[];
}

// Invented names (checked by shared/tools/name-check.mjs like every file of the repository).
const FIRST = [
  'Alder', 'Brisa', 'Calloway', 'Dovie', 'Elowen', 'Fenna', 'Galen', 'Hesper', 'Ivo', 'Jessamy', 'Kestrel', 'Liesl', 'Merrin', 'Nolwenn', 'Orrin', 'Pim',
  'Quilla', 'Rosalind', 'Sorrel', 'Tamsin', 'Ulric', 'Vesna', 'Wilder', 'Xanthe', 'Yarrow', 'Zinnia', 'Anselm', 'Bettany', 'Corin', 'Dagny', 'Emrys', 'Ffion',
  'Gideon', 'Honora', 'Isolde', 'Jory', 'Kerensa', 'Lorcan', 'Maelis', 'Niamh',
];
const LAST = [
  'Ashcombe', 'Brackwater', 'Coldharbour', 'Dunmore-Pike', 'Elmsworth', 'Fallowfield', 'Gorsebrook', 'Hartwell-Ide', 'Inchcape', 'Juniperhill', 'Kettlewell',
  'Larkspur', 'Mossgrove', 'Netherby', 'Oakhurst-Fane', 'Pennyroyal', 'Quarrendon', 'Rookwell', 'Saltonstall', 'Thornbury-Vail', 'Underhay', 'Vellacott',
  'Whinmoor', 'Yarwood', 'Alderney-Cobb', 'Bramblecote', 'Cinderford', 'Dapplewick', 'Evershed', 'Foxcombe', 'Gildersleeve', 'Hollowell', 'Ivybridge',
  'Jessop-Rain', 'Kingsmere', 'Lowther-Ash', 'Millbeck', 'Nightingale-Roe', 'Orchardleigh', 'Pollard-Weir', 'Quenby', 'Redmarley', 'Stowlangtoft',
  'Tallowmere', 'Upcott', 'Verity-Lane', 'Wrenfield', 'Yelverton-Moss',
];

const CANCEL_REASONS = ['Patient asked to move the visit', 'Patient unwell', 'Work commitment', 'Transport fell through', 'Family emergency'];
/** The first weeks are booked at the table's minutes; then weekly at the calibrated minutes. */
export const CALIBRATION_STARTS_WEEK = 5;

// Teeth by procedure mix: FDI codes of the permanent dentition, molars weighted as in a specialist's list.
const TEETH = ['11', '12', '13', '21', '22', '23', '14', '15', '24', '25', '34', '35', '44', '45', '16', '26', '36', '46', '17', '27', '37', '47'];
const MOLARS = ['16', '26', '36', '46', '17', '27', '37', '47'];

interface Task {
  case: number;
  visitIndex: number;
  operatorId: number;
  locationId: number;
  /** Earliest local day it may be booked. */
  fromDay: LocalDay;
  /** The day it becomes urgent to place (second visits: 21 days after the first). */
  dueDay: LocalDay;
}

interface CaseState {
  est: EstimateResult;
  urgency: Urgency;
  referral: number;
  visitsDone: number;
  attended: boolean;
  open: boolean;
  /** Appointment indexes of the case. */
  appointments: number[];
}

export function generateHistory(input: HistoryInput): History {
  const rnd = mulberry32(input.seed);
  const between = (a: number, b: number) => a + rnd() * (b - a);
  const int = (a: number, b: number) => Math.floor(between(a, b + 1));
  const chance = (p: number) => rnd() < p;
  const gauss = () => normal(rnd);
  const out: History = { patients: [], referrals: [], cases: [], appointments: [], reminders: [], visits: [] };
  const zone = input.locations[0]?.timeZone ?? 'UTC';
  const todayClock = clockFor(zone, { first: Math.floor(input.now / DAY_MS) - 2, last: Math.floor(input.now / DAY_MS) + 2 });
  const today = todayClock.day(input.now);
  const firstDay = today - input.weeks * 7;
  const lastDay = today - 1;
  const span = { first: firstDay - 40, last: today + 2 };
  const locs = input.locations.map((l) => ({ l, clock: clockFor(l.timeZone, span), closed: closedDays(l) }));
  const clockOf = new Map(locs.map((x) => [x.l.id, x.clock]));
  const localAt = (clock: ZoneClock, day: LocalDay, minutes: number) => clock.firstInstantAtOrAfter(day * DAY_MS + minutes * MINUTE_MS);

  // Unique invented patients: a shuffled walk over first × last names.
  const pairs = FIRST.flatMap((f) => LAST.map((l) => [f, l] as const));
  for (let i = pairs.length - 1; i > 0; i--) {
    const j = Math.floor(rnd() * (i + 1));
    [pairs[i], pairs[j]] = [pairs[j]!, pairs[i]!];
  }
  let nextPair = 0;
  const newPatient = (): number => {
    const [firstName, lastName] = pairs[nextPair++ % pairs.length]!;
    const y = int(1948, 2004);
    const dob = `${y}-${String(int(1, 12)).padStart(2, '0')}-${String(int(1, 28)).padStart(2, '0')}`;
    const handle = `${firstName}.${lastName}`.toLowerCase().replace(/[^a-z.]/g, '');
    // One number per patient: the fictional 555-0100…0199 lines across several area codes (the practice's own are in 202).
    const n = out.patients.length;
    const phone = `+1${PATIENT_AREA_CODES[Math.floor(n / 100) % PATIENT_AREA_CODES.length]}5550${100 + (n % 100)}`;
    out.patients.push({ firstName, lastName, dateOfBirth: dob, phone, email: `${handle}@example.com`, smsConsent: chance(0.85) });
    return out.patients.length - 1;
  };
  const weights = input.dentistIds.map((_, i) => 1 / (i + 1.5));
  const totalWeight = weights.reduce((s, w) => s + w, 0);
  const dentist = () => {
    let x = rnd() * totalWeight;
    for (let i = 0; i < weights.length; i++) if ((x -= weights[i]!) <= 0) return input.dentistIds[i]!;
    return input.dentistIds[input.dentistIds.length - 1]!;
  };

  const estimates = new Map<string, EstimateResult>();
  const estimateOf = (toothFdi: string, procedure: Procedure, diagnosis: Level) => {
    const k = `${toothFdi}|${procedure}|${diagnosis}`;
    let e = estimates.get(k);
    if (!e) estimates.set(k, (e = estimate({ toothFdi, procedure, assessment: { diagnosis } }, input.table)));
    return e;
  };
  const drawCase = (singleVisit: boolean, procedure?: Procedure): { toothFdi: string; procedure: Procedure; est: EstimateResult } => {
    for (let attempt = 0; ; attempt++) {
      const p: Procedure = procedure ?? (() => {
        const x = rnd();
        return x < 0.58 ? 'initial' : x < 0.74 ? 'retreatment' : x < 0.86 ? 'consult' : x < 0.95 ? 'emergency' : 'surgery';
      })();
      const toothFdi = chance(0.55) ? MOLARS[int(0, MOLARS.length - 1)]! : TEETH[int(0, TEETH.length - 1)]!;
      const d = rnd();
      const est = estimateOf(toothFdi, p, d < 0.5 ? 'low' : d < 0.88 ? 'moderate' : 'high');
      if (!singleVisit || est.visits.length === 1 || attempt > 8) return { toothFdi, procedure: p, est };
    }
  };

  const cases: CaseState[] = [];
  const newCase = (locationId: number, operatorId: number, day: LocalDay, singleVisit: boolean, procedure?: Procedure, drawn?: ReturnType<typeof drawCase>): number => {
    const c = drawn ?? drawCase(singleVisit, procedure);
    const urgency: Urgency = c.procedure === 'emergency' ? 'urgent' : chance(0.22) ? 'soon' : 'routine';
    const lead = urgency === 'urgent' ? int(0, 2) : urgency === 'soon' ? int(3, 12) : int(7, 35);
    const patient = newPatient();
    out.referrals.push({ patient, dentistId: dentist(), locationId, receivedOn: formatLocalDate(day - lead), urgency, procedure: c.procedure, status: 'booked', statusReason: null, events: [] });
    const referral = out.referrals.length - 1;
    out.cases.push({ referral, toothFdi: c.toothFdi, procedure: c.procedure, status: 'booked', estimate: c.est, operatorId });
    cases.push({ est: c.est, urgency, referral, visitsDone: 0, attended: false, open: true, appointments: [] });
    return cases.length - 1;
  };

  // Work queues per operator and location: second visits and visits to book again after a miss.
  const tasks: Task[] = [];
  const completed: (CompletedVisit & { day: LocalDay })[] = [];
  let model: CalibrationModel | null = null;
  let modelWeek = -1;
  const options = calibrationOptions(input.table);

  const ruleDays = new Map<ReportWorkingRule, Set<LocalDay>>();
  for (const op of input.operators) for (const r of op.rules) ruleDays.set(r, new Set(expandRuleDays(r.rrule, firstDay, firstDay, lastDay)));

  /** Booked minutes of a visit: the table's before calibration starts, then the calibrated prediction. */
  const lengthOf = (est: EstimateResult, procedure: Procedure, visitIndex: number, operatorId: number) => {
    if (!model) return est.visits[visitIndex]!.minutes;
    const cal = calibrationFor(model, { procedure, toothGroup: est.toothGroup, level: est.level }, operatorId, input.table.calibration.bookingQuantile);
    return Math.min(180, bookedMinutes(input.tableMinutes(est.toothFdi, procedure, est.canals, est.level), cal, 5));
  };
  const bookedLength = (k: number, visitIndex: number, operatorId: number) => lengthOf(cases[k]!.est, out.cases[k]!.procedure, visitIndex, operatorId);
  const turnoverMs = input.table.turnoverMinutes * MINUTE_MS;

  for (let day = firstDay; day <= lastDay; day++) {
    const week = Math.floor((day - firstDay) / 7);
    if (week >= CALIBRATION_STARTS_WEEK && week !== modelWeek) {
      const seen = completed.filter((v) => v.day < day);
      model = seen.length ? learnCalibration(seen, options) : null;
      modelWeek = week;
    }
    const nearEnd = day > lastDay - 24;
    for (const { l, clock, closed } of locs) {
      const open = openOnDay(clock, l, closed, day);
      if (!open.length) continue;
      const closing = open[open.length - 1]!.end;
      const chairs = input.chairs.filter((c) => c.locationId === l.id);
      const chairBusy = new Map<number, Interval[]>(chairs.map((c) => [c.id, []]));
      const micBusy = new Map<number, Interval[]>();
      // Each chair's actual use so far (the operators are walked one after the other, so by booked start).
      const chairActual = new Map<number, { bookedStart: number; freeAt: number }[]>();
      const free = (list: Interval[] | undefined, s: number, e: number) => !(list ?? []).some((iv) => iv.start < e && s < iv.end);
      for (const op of input.operators) {
        const pieces: Interval[] = [];
        for (const r of op.rules) if (r.locationId === l.id && ruleDays.get(r)!.has(day)) pieces.push(...wallRangeOnDay(clock, day, r, r.breaks));
        const work = intersectIntervals(pieces.sort((a, b) => a.start - b.start), open);
        let opFreeAt = -Infinity;
        /** The visit took place: seated after the booked start, the operator and the chair being free, for as long as it took. */
        const attend = (ai: number, kk: number, vi: number) => {
          const ap = out.appointments[ai]!;
          const cs = cases[kk]!;
          const tableMin = input.tableMinutes(cs.est.toothFdi, out.cases[kk]!.procedure, cs.est.canals, cs.est.level);
          const bias = cs.est.toothGroup === 'molar' && cs.est.level === 'high' ? 1.15 : 1;
          const duration = Math.max(10, Math.round(tableMin * op.pace * bias * Math.exp(0.12 * gauss())));
          const delay = Math.min(12, Math.max(-3, Math.round(2 + 3 * gauss())));
          // Not before the chair is clean from a visit booked earlier on it that ran over.
          const chairFreeAt = (chairActual.get(ap.chairId) ?? []).filter((x) => x.bookedStart < ap.start).reduce((m, x) => Math.max(m, x.freeAt), -Infinity);
          const seated = Math.max(ap.start + delay * MINUTE_MS, opFreeAt, chairFreeAt);
          // Running more than half an hour behind, the team makes up time (down to 80 % of the booked length),
          // and no visit runs more than 45 minutes over its booking, so one slow morning does not push a chair's
          // day hours past closing (invented demo behaviour).
          const behind = (seated - ap.start) / MINUTE_MS - 30;
          const bookedMin = (ap.end - ap.start) / MINUTE_MS;
          const caught = behind > 0 ? Math.max(10, Math.min(duration, Math.max(Math.round(0.8 * bookedMin), duration - Math.round(behind)))) : duration;
          const taken = Math.min(caught, bookedMin + 45);
          const dismissed = seated + taken * MINUTE_MS;
          opFreeAt = dismissed + 2 * MINUTE_MS;
          (chairActual.get(ap.chairId) ?? chairActual.set(ap.chairId, []).get(ap.chairId)!).push({ bookedStart: ap.start, freeAt: dismissed + ap.turnoverMinutes * MINUTE_MS });
          ap.state = 'dismissed';
          ap.seatedAt = seated;
          ap.dismissedAt = dismissed;
          out.visits.push({
            appointment: ai,
            visitDate: formatLocalDate(clock.day(seated)),
            toothFdi: cs.est.toothFdi,
            procedure: out.cases[kk]!.procedure,
            toothGroup: cs.est.toothGroup,
            canals: cs.est.canals,
            level: cs.est.level,
            operatorId: op.id,
            estimatedMinutes: tableMin,
            actualMinutes: taken,
          });
          completed.push({ procedure: out.cases[kk]!.procedure, toothGroup: cs.est.toothGroup, level: cs.est.level, operatorId: op.id, estimatedMinutes: tableMin, actualMinutes: taken, day });
          cs.attended = true;
          cs.visitsDone = Math.max(cs.visitsDone, vi + 1);
          if (vi + 1 < cs.est.visits.length) {
            const min = cs.est.visits[vi + 1]!.earliestDaysAfterPrevious ?? 7;
            tasks.push({ case: kk, visitIndex: vi + 1, operatorId: op.id, locationId: l.id, fromDay: day + min, dueDay: day + (cs.est.visits[vi + 1]!.latestDaysAfterPrevious ?? 21) });
          } else cs.open = false;
        };
        for (const piece of work) {
          let cursor = Math.ceil(piece.start / GRID) * GRID;
          while (cursor < piece.end) {
            if (chance(input.idleShare ?? 0.15)) {
              cursor += int(3, 9) * GRID;
              continue;
            }
            // The next task of this operator here, or a new case that fits what is left of the block
            // (near its end: a consultation or an emergency); nothing is created while no chair is free.
            const ti = tasks.findIndex((t) => t.operatorId === op.id && t.locationId === l.id && t.fromDay <= day);
            const task = ti >= 0 ? tasks[ti]! : null;
            // Inside the working block, and the chair cleaned by closing time.
            const fits = (m: number) => cursor + m * MINUTE_MS <= piece.end && cursor + m * MINUTE_MS + turnoverMs <= closing;
            let drawn: ReturnType<typeof drawCase> | null = null;
            let visitIndex = 0;
            let est: EstimateResult;
            let minutes: number;
            if (task && fits(bookedLength(task.case, task.visitIndex, op.id))) {
              visitIndex = task.visitIndex;
              est = cases[task.case]!.est;
              minutes = bookedLength(task.case, visitIndex, op.id);
            } else {
              for (let attempt = 0; attempt < 12 && !drawn; attempt++) {
                const d = drawCase(nearEnd, attempt >= 6 ? (chance(0.5) ? 'consult' : 'emergency') : undefined);
                if (fits(lengthOf(d.est, d.procedure, 0, op.id))) drawn = d;
              }
              if (!drawn) break;
              est = drawn.est;
              minutes = lengthOf(drawn.est, drawn.procedure, 0, op.id);
            }
            const needsScope = est.visits[visitIndex]!.needsMicroscope;
            const turnover = est.visits[visitIndex]!.turnoverMinutes;
            const start = cursor;
            const end = start + minutes * MINUTE_MS;
            const chairEnd = end + turnover * MINUTE_MS;
            // A chair free with its turnover; for a microscope visit the one carrying a free fixed scope first.
            const candidates = [...chairs].sort((a, b) => (needsScope ? Number(b.fixedMicroscopeId !== null) - Number(a.fixedMicroscopeId !== null) : Number(a.fixedMicroscopeId !== null) - Number(b.fixedMicroscopeId !== null)));
            const chair = candidates.find((ch) => free(chairBusy.get(ch.id), start, chairEnd) && (!needsScope || ch.fixedMicroscopeId === null || free(micBusy.get(ch.fixedMicroscopeId), start, end)));
            if (!chair) {
              // No chair free now: try again five minutes later.
              cursor += GRID;
              continue;
            }
            let k: number;
            if (drawn) k = newCase(l.id, op.id, day, nearEnd, undefined, drawn);
            else {
              k = task!.case;
              tasks.splice(ti, 1);
            }
            let microscopeId: number | null = null;
            if (needsScope) {
              if (chair.fixedMicroscopeId !== null) microscopeId = chair.fixedMicroscopeId;
              else microscopeId = input.microscopes.find((m) => m.mobile && m.locationId === l.id && free(micBusy.get(m.id), start, end))?.id ?? null;
            }
            const place = (kk: number, vi: number, s: number, e: number, createdAt: number) => {
              chairBusy.get(chair.id)!.push({ start: s, end: e + turnover * MINUTE_MS });
              if (microscopeId !== null) (micBusy.get(microscopeId) ?? micBusy.set(microscopeId, []).get(microscopeId)!).push({ start: s, end: e });
              out.appointments.push({
                case: kk,
                visitIndex: vi,
                locationId: l.id,
                chairId: chair.id,
                operatorId: op.id,
                microscopeId,
                start: s,
                end: e,
                turnoverMinutes: turnover,
                state: 'dismissed',
                createdAt,
                confirmedAt: null,
                confirmedVia: null,
                cancelledAt: null,
                cancelNoticeHours: null,
                cancelReason: null,
                seatedAt: null,
                dismissedAt: null,
              });
              cases[kk]!.appointments.push(out.appointments.length - 1);
              return out.appointments.length - 1;
            };
            const createdAt = bookingTime(k, visitIndex, start);
            const a = place(k, visitIndex, start, end, createdAt);
            const appt = out.appointments[a]!;
            const x = rnd();
            const again = () => tasks.push({ case: k, visitIndex, operatorId: op.id, locationId: l.id, fromDay: day + int(3, 9), dueDay: day + 14 });
            if (x < 0.05) {
              appt.state = 'no_show';
              confirm(a, chance(0.35));
              again();
            } else if (x < 0.09) {
              // Late: 1–40 hours ahead; on the day itself the time is often filled from the emergency list.
              const cancelledAt = Math.max(createdAt + HOUR, start - (chance(0.4) ? between(1, 5) : between(5, 40)) * HOUR);
              cancel(a, cancelledAt);
              again();
              if (clock.day(cancelledAt) === day && start - cancelledAt > HOUR && chance(0.6)) {
                const fill = newCase(l.id, op.id, day, true, 'emergency');
                const fillMinutes = Math.min(minutes, bookedLength(fill, 0, op.id));
                const fillCreated = cancelledAt + between(15, 50) * MINUTE_MS;
                setReferralTimes(fill, fillCreated, true);
                const fa = place(fill, 0, start, start + fillMinutes * MINUTE_MS, fillCreated);
                out.appointments[fa]!.confirmedAt = fillCreated + MINUTE_MS;
                out.appointments[fa]!.confirmedVia = 'desk';
                attend(fa, fill, 0);
              }
            } else if (x < 0.15) {
              // Early: 3–14 days ahead; the time often went to another case booked after it.
              const cancelledAt = Math.max(createdAt + HOUR, start - between(3, 14) * DAY_MS);
              cancel(a, cancelledAt);
              again();
              if (chance(0.6)) {
                const other = newCase(l.id, op.id, day, nearEnd);
                const m2 = Math.min(minutes, bookedLength(other, 0, op.id));
                const created2 = cancelledAt + between(1, 48) * HOUR;
                setReferralTimes(other, Math.min(created2, start - 2 * HOUR), false);
                const oa = place(other, 0, start, start + m2 * MINUTE_MS, Math.min(created2, start - 2 * HOUR));
                confirm(oa, chance(0.86));
                attend(oa, other, 0);
              }
            } else {
              confirm(a, chance(0.86));
              attend(a, k, visitIndex);
            }
            cursor = end;
          }
        }
      }
    }
    // A task left too long (the operator's days were full) goes first next time: sort by due day.
    tasks.sort((a, b) => a.dueDay - b.dueDay);
  }

  // ---- helpers that need the output arrays (function declarations are hoisted) ----

  /** When a visit was booked: for a first visit after triage and planning, for later ones at the previous dismissal. */
  function bookingTime(k: number, visitIndex: number, start: number): number {
    const cs = cases[k]!;
    const prev = cs.appointments.map((i) => out.appointments[i]!).filter((x) => x.start < start);
    const lastDismissed = prev.map((x) => x.dismissedAt ?? x.cancelledAt ?? x.start).reduce((m, t) => Math.max(m, t), -Infinity);
    if (visitIndex > 0 || prev.length) return Math.min(start - 2 * HOUR, lastDismissed + 10 * MINUTE_MS);
    const r = out.referrals[cs.referral]!;
    const clock = clockOf.get(r.locationId)!;
    const receivedAt = Math.min(start - 3 * HOUR, localAt(clock, dayNumber(r.receivedOn), int(8 * 60, 14 * 60)));
    const bookedAt = Math.min(start - 2 * HOUR, receivedAt + (cs.urgency === 'urgent' ? between(0.5, 3) * HOUR : between(1, 4) * DAY_MS));
    setReferralChain(cs.referral, receivedAt, bookedAt);
    return bookedAt;
  }

  function setReferralTimes(k: number, bookedAt: number, sameDay: boolean) {
    const cs = cases[k]!;
    const r = out.referrals[cs.referral]!;
    const receivedAt = bookedAt - (sameDay ? between(0.5, 1.5) * HOUR : between(1, 3) * DAY_MS);
    r.receivedOn = formatLocalDate(clockOf.get(r.locationId)!.day(receivedAt));
    setReferralChain(cs.referral, receivedAt, bookedAt);
  }

  function setReferralChain(ri: number, receivedAt: number, bookedAt: number) {
    const r = out.referrals[ri]!;
    const d = bookedAt - receivedAt;
    r.events = [
      { status: 'received', at: receivedAt, reason: null },
      { status: 'triaged', at: receivedAt + d * 0.4, reason: null },
      { status: 'planned', at: receivedAt + d * 0.8, reason: null },
      { status: 'booked', at: bookedAt, reason: 'Booked from the schedule' },
    ];
  }

  function cancel(ai: number, cancelledAt: number) {
    const ap = out.appointments[ai]!;
    confirm(ai, chance(0.5), cancelledAt);
    ap.state = 'cancelled';
    ap.cancelledAt = cancelledAt;
    ap.cancelNoticeHours = Math.round((ap.start - cancelledAt) / 360_000) / 10;
    ap.cancelReason = CANCEL_REASONS[int(0, CANCEL_REASONS.length - 1)]!;
  }

  /** Reminders that went out before `until` (48 h, then 24 h while unconfirmed) and how the visit was confirmed. */
  function confirm(ai: number, wantsToConfirm: boolean, until = Infinity) {
    const ap = out.appointments[ai]!;
    const patient = out.patients[out.referrals[cases[ap.case]!.referral]!.patient]!;
    const t48 = ap.start - 48 * HOUR + int(0, 4) * MINUTE_MS;
    const t24 = ap.start - 24 * HOUR + int(0, 4) * MINUTE_MS;
    const texts = patient.smsConsent;
    let confirmedAt: number | null = null;
    let via: HistoryAppointment['confirmedVia'] = null;
    if (wantsToConfirm) {
      const x = rnd();
      if (texts && x < 0.62 && t48 > ap.createdAt) [confirmedAt, via] = [t48 + between(5, 240) * MINUTE_MS, 'sms'];
      else if (texts && x < 0.76 && t24 > ap.createdAt) [confirmedAt, via] = [t24 + between(5, 180) * MINUTE_MS, 'sms'];
      else if (x < 0.9) [confirmedAt, via] = [Math.min(ap.start - HOUR, ap.createdAt + between(1, 30) * HOUR), 'link'];
      else [confirmedAt, via] = [Math.max(ap.createdAt + MINUTE_MS, ap.start - between(2, 30) * HOUR), 'desk'];
      if (confirmedAt >= until || confirmedAt >= ap.start) [confirmedAt, via] = [null, null];
    }
    ap.confirmedAt = confirmedAt;
    ap.confirmedVia = via;
    if (!texts) return;
    if (t48 > ap.createdAt && t48 < until) out.reminders.push({ appointment: ai, ruleId: 'text-48h', sentAt: t48 });
    if (t24 > ap.createdAt && t24 < until && (confirmedAt === null || confirmedAt > t24)) out.reminders.push({ appointment: ai, ruleId: 'text-24h', sentAt: t24 });
  }

  function dayNumber(date: string): LocalDay {
    return Date.UTC(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10))) / DAY_MS;
  }

  // ---- the referrals' ends ----
  cases.forEach((cs, k) => {
    const r = out.referrals[cs.referral]!;
    const appts = cs.appointments.map((i) => out.appointments[i]!).sort((a, b) => a.start - b.start);
    const done = appts.filter((a) => a.state === 'dismissed');
    if (!appts.length) {
      // Planned but never placed before today (the days were full): it waits in the backlog.
      const clock = clockOf.get(r.locationId)!;
      const receivedAt = Math.min(input.now - 3 * HOUR, localAt(clock, dayNumber(r.receivedOn), 10 * 60));
      r.events = (['received', 'triaged', 'planned'] as const).map((status, j) => ({ status, at: Math.min(input.now - HOUR, receivedAt + j * DAY_MS), reason: null }));
      r.status = 'planned';
      out.cases[k]!.status = 'planned';
      out.cases[k]!.operatorId = null;
      return;
    }
    if (!r.events.length) setReferralChain(cs.referral, appts[0]!.createdAt - DAY_MS, appts[0]!.createdAt);
    if (done.length) r.events.push({ status: 'in_treatment', at: done[0]!.seatedAt!, reason: null });
    const lastEnd = done.length ? done[done.length - 1]!.dismissedAt! : 0;
    if (!cs.open && done.length && lastEnd > input.now - 3 * DAY_MS) {
      // Treated in the last days: the endodontist has yet to write it up (Finish treatment on the case sheet).
    } else if (!cs.open && done.length) {
      const end = lastEnd;
      r.events.push({ status: 'completed', at: end + 20 * MINUTE_MS, reason: null });
      if (chance(0.6)) r.events.push({ status: 'report_sent', at: Math.min(input.now - HOUR, end + between(1, 3) * DAY_MS), reason: null });
    } else if ((appts[appts.length - 1]?.start ?? 0) > input.now - 10 * DAY_MS) {
      // Missed or cancelled in the last days: still to be booked again by the front desk. With no visit
      // left, the referral is back at planned, as the schedule does when its last visit goes.
      const last = appts[appts.length - 1]!;
      const live = appts.some((a) => a.state !== 'cancelled' && a.state !== 'no_show');
      if (!live && r.events[r.events.length - 1]?.status === 'booked') {
        const why = last.state === 'no_show' ? 'missed' : 'cancelled';
        r.events.push({ status: 'planned', at: Math.min(input.now - HOUR, last.cancelledAt ?? last.end), reason: `Its visit was ${why} and none is left; to be booked again` });
      }
    } else {
      const last = appts[appts.length - 1]!;
      const reason = 'Did not come back after a missed or cancelled visit; the referring dentist was told';
      r.events.push({ status: 'cancelled', at: Math.min(input.now - HOUR, (last.dismissedAt ?? last.cancelledAt ?? last.start) + 2 * DAY_MS), reason });
    }
    r.status = r.events[r.events.length - 1]!.status;
    r.statusReason = r.events[r.events.length - 1]!.reason;
    out.cases[k]!.status = r.status;
  });

  // ---- referrals still waiting today, and some declined or cancelled before any visit ----
  const mainLocations = input.locations.map((l) => l.id);
  const waiting: [ReferralStatus, number][] = [
    ['received', 9],
    ['triaged', 8],
    ['planned', 9],
  ];
  for (const [status, count] of waiting) {
    for (let i = 0; i < count; i++) {
      const locationId = mainLocations[int(0, mainLocations.length - 1)]!;
      const clock = clockOf.get(locationId)!;
      const receivedDay = today - int(status === 'received' ? 0 : 2, 21);
      const receivedAt = Math.min(input.now - HOUR, localAt(clock, receivedDay, int(8 * 60, 16 * 60)));
      const c = drawCase(false);
      const patient = newPatient();
      const steps: ReferralStatus[] = status === 'received' ? ['received'] : status === 'triaged' ? ['received', 'triaged'] : ['received', 'triaged', 'planned'];
      let at = receivedAt;
      const events = steps.map((s, j) => ({ status: s, at: (at = Math.min(input.now - HOUR, at + (j === 0 ? 0 : between(3, 20) * HOUR))), reason: null }));
      out.referrals.push({ patient, dentistId: dentist(), locationId, receivedOn: formatLocalDate(clock.day(receivedAt)), urgency: chance(0.2) ? 'soon' : 'routine', procedure: c.procedure, status, statusReason: null, events });
      out.cases.push({ referral: out.referrals.length - 1, toothFdi: c.toothFdi, procedure: c.procedure, status, estimate: status === 'received' ? null : c.est, operatorId: null });
    }
  }
  for (const [status, reason, count] of [
    ['declined', 'Outside what the practice treats; referred on to oral surgery', 4],
    ['cancelled', 'Patient chose extraction with the referring dentist', 3],
  ] as const) {
    for (let i = 0; i < count; i++) {
      const locationId = mainLocations[int(0, mainLocations.length - 1)]!;
      const clock = clockOf.get(locationId)!;
      const receivedAt = localAt(clock, firstDay + int(0, input.weeks * 7 - 7), int(8 * 60, 16 * 60));
      const c = drawCase(false);
      const patient = newPatient();
      out.referrals.push({
        patient,
        dentistId: dentist(),
        locationId,
        receivedOn: formatLocalDate(clock.day(receivedAt)),
        urgency: 'routine',
        procedure: c.procedure,
        status,
        statusReason: reason,
        events: [
          { status: 'received', at: receivedAt, reason: null },
          { status, at: receivedAt + between(1, 3) * DAY_MS, reason },
        ],
      });
      out.cases.push({ referral: out.referrals.length - 1, toothFdi: c.toothFdi, procedure: c.procedure, status, estimate: null, operatorId: null });
    }
  }
  return out;
}
