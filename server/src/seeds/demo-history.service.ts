import { Inject, Injectable } from '@nestjs/common';
import type { Level, OpeningHours, Procedure } from '@ostium/shared';
import { randomUUID } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { EstimatesService } from '../estimates/estimates.service.js';
import { makeVisitToken, visitLink } from '../reminders/confirm-link.util.js';
import { DEFAULT_REMINDER_SETTINGS } from '../reminders/default-reminder-settings.js';
import { placeholderValues } from '../reminders/reminder-values.util.js';
import { renderTemplate } from '../reminders/rules/templates.util.js';
import { zoneClockToday, DAY_MS } from '../reports/report-time.util.js';
import { visitCells } from '../scheduling/occupancy-cells.util.js';
import { generateHistory, type History, type HistoryOperator } from './demo-history.util.js';

type Json<T> = T | string;
const json = <T>(v: Json<T> | null): T | null => (v === null ? null : typeof v === 'string' ? (JSON.parse(v) as T) : v);
const sqlTime = (t: number | null) => (t === null ? null : new Date(t).toISOString().slice(0, 23).replace('T', ' '));

/** How the demo endodontists really work against the table (the truth the estimates learn): by e-mail. */
const DEMO_PACE: Record<string, number> = {
  'endo@quillfern-endo.test': 1.0,
  'endo2@quillfern-endo.test': 1.25,
  'endo3@quillfern-endo.test': 0.9,
};
// The demo's referring dentists, most frequent first (seeds/demo/referrals.json).
const DENTIST_ORDER = ['Dr. Ottilie Farrow', 'Dr. Cassius Wendlebury', 'Dr. Priya Thornquist', 'Dr. Hollis Abernathy-Vale', 'Dr. Mireille Oduya', 'Dr. Leopold Fennimore', 'Dr. Anneliese Quarrington'];
export const HISTORY_WEEKS = 17;
export const HISTORY_SEED = 20261202;
const ROWS_PER_INSERT = 1000;

/**
 * Writes the generated past months (demo-history.util.ts) of the demo practice in one transaction with
 * multi-row INSERTs (thousands of rows in a few seconds; these rows are not in the audit log). Every
 * visit that holds its chair gets its occupancy cells, so the booking guard sees the history like any
 * booking. Runs only while the practice has no visit before today, so a second run adds nothing.
 */
@Injectable()
export class DemoHistoryService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly estimates: EstimatesService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  private select<T extends object>(sql: string, replacements: Record<string, unknown>, transaction?: Transaction) {
    return this.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT, transaction });
  }

  private async insert(table: string, columns: string[], rows: unknown[][], transaction: Transaction) {
    for (let i = 0; i < rows.length; i += ROWS_PER_INSERT) {
      const chunk = rows.slice(i, i + ROWS_PER_INSERT);
      const values = chunk.map(() => `(${columns.map(() => '?').join(', ')})`).join(', ');
      await this.sequelize.query(`INSERT INTO ${table} (${columns.map((c) => `\`${c}\``).join(', ')}) VALUES ${values}`, { replacements: chunk.flat(), transaction });
    }
  }

  async load(practiceId: number, now = Date.now()): Promise<string> {
    const [practice] = await this.select<{ name: string }>('SELECT name FROM practices WHERE id = :practiceId', { practiceId });
    const locations = await this.select<{ id: number; name: string; time_zone: string; opening_hours: Json<OpeningHours> }>(
      'SELECT id, name, time_zone, opening_hours FROM locations WHERE practice_id = :practiceId ORDER BY id',
      { practiceId },
    );
    if (!practice || !locations.length) return '';
    const today = zoneClockToday(locations[0]!.time_zone, now);
    // Any visit before yesterday (UTC midnight, on the safe side of every zone) means the practice has a past already.
    const todayStart = new Date((today - 1) * DAY_MS);
    const [{ n }] = await this.select<{ n: unknown }>('SELECT COUNT(*) AS n FROM appointments WHERE practice_id = :practiceId AND start < :todayStart', { practiceId, todayStart });
    if (Number(n) > 0) return ', past visits already there (none added)';

    const [closures, chairs, microscopes, users, rules, dentists, table] = await Promise.all([
      this.select<{ location_id: number; date: string }>("SELECT location_id, DATE_FORMAT(date, '%Y-%m-%d') AS date FROM location_closures WHERE practice_id = :practiceId", { practiceId }),
      this.select<{ id: number; location_id: number; fixed_microscope_id: number | null }>('SELECT id, location_id, fixed_microscope_id FROM chairs WHERE practice_id = :practiceId AND active = 1 ORDER BY id', { practiceId }),
      this.select<{ id: number; location_id: number; mobile: number | boolean }>('SELECT id, location_id, mobile FROM microscopes WHERE practice_id = :practiceId AND active = 1 ORDER BY id', { practiceId }),
      this.select<{ id: number; email: string }>("SELECT id, email FROM users WHERE practice_id = :practiceId AND role = 'endodontist' AND active = 1 ORDER BY id", { practiceId }),
      this.select<{ operator_id: number; location_id: number; rrule: string; start_local: string; end_local: string; breaks: Json<{ start: string; end: string }[]> | null }>(
        'SELECT operator_id, location_id, rrule, start_local, end_local, breaks FROM working_rules WHERE practice_id = :practiceId ORDER BY id',
        { practiceId },
      ),
      this.select<{ id: number; name: string }>('SELECT id, name FROM referring_dentists WHERE practice_id = :practiceId', { practiceId }),
      this.estimates.currentTable(practiceId),
    ]);
    const operators: HistoryOperator[] = users.map((u) => ({
      id: u.id,
      pace: DEMO_PACE[u.email] ?? 1,
      rules: rules
        .filter((r) => r.operator_id === u.id)
        .map((r) => ({ locationId: r.location_id, rrule: r.rrule, startLocal: r.start_local, endLocal: r.end_local, breaks: (json(r.breaks) ?? []).map((b) => ({ startLocal: b.start, endLocal: b.end })) })),
    }));
    const dentistIds = [...dentists].sort((a, b) => rank(a.name) - rank(b.name) || a.id - b.id).map((d) => d.id);
    if (!operators.some((o) => o.rules.length) || !dentistIds.length) return '';
    const minutes = new Map<string, number>();
    const history = generateHistory({
      now,
      weeks: HISTORY_WEEKS,
      seed: HISTORY_SEED,
      practiceName: practice.name,
      table,
      locations: locations.map((l) => ({ id: l.id, name: l.name, timeZone: l.time_zone, openingHours: json(l.opening_hours) ?? [], closures: closures.filter((c) => c.location_id === l.id).map((c) => c.date) })),
      chairs: chairs.map((c) => ({ id: c.id, locationId: c.location_id, fixedMicroscopeId: c.fixed_microscope_id })),
      microscopes: microscopes.map((m) => ({ id: m.id, locationId: m.location_id, mobile: !!m.mobile })),
      operators,
      dentistIds,
      tableMinutes: (toothFdi: string, procedure: Procedure, canals: number, level: Level) => {
        const k = `${toothFdi}|${procedure}|${canals}|${level}`;
        let m = minutes.get(k);
        if (m === undefined) minutes.set(k, (m = this.estimates.tableMinutesAt(table, toothFdi, procedure, canals, level)));
        return m;
      },
    });
    const names = { practice: practice.name, locations: new Map(locations.map((l) => [l.id, { name: l.name, timeZone: l.time_zone }])) };
    await this.sequelize.transaction((t) => this.write(practiceId, history, table.version, names, t));
    const noShows = history.appointments.filter((a) => a.state === 'no_show').length;
    return `, ${history.appointments.length} past visits over ${HISTORY_WEEKS} weeks (${noShows} no-shows), ${history.referrals.length} past referrals`;
  }

  /** The text a past reminder carried: its rule's default template, filled as the composer fills it (the link has long expired). */
  private historyText(ruleId: string, appointmentId: number, start: number, practice: string, location: { name: string; timeZone: string }): string {
    const settings = DEFAULT_REMINDER_SETTINGS;
    const rule = settings.rules.find((r) => r.id === ruleId && r.channel === 'sms') ?? settings.rules.find((r) => r.channel === 'sms')!;
    const template = settings.templates.find((x) => x.id === rule.templateId && x.channel === 'sms')!;
    const token = makeVisitToken(this.config.messaging.linkSecret, appointmentId, start + settings.confirmLinkValidHours * 3_600_000);
    const values = placeholderValues({ channel: 'sms', practice, location: location.name, start, zone: location.timeZone, confirmLink: visitLink(this.config.publicUrl, token) });
    return renderTemplate(template.body, values).text;
  }

  private async write(practiceId: number, h: History, tableVersion: number, names: { practice: string; locations: Map<number, { name: string; timeZone: string }> }, t: Transaction) {
    const stamp = sqlTime(Date.now());
    await this.insert(
      'patients',
      ['practice_id', 'first_name', 'last_name', 'date_of_birth', 'phone', 'email', 'preferred_channel', 'sms_consent', 'sms_consent_at', 'sms_consent_source', 'time_zone', 'created_at', 'updated_at'],
      h.patients.map((p) => [practiceId, p.firstName, p.lastName, p.dateOfBirth, p.phone, p.email, p.smsConsent ? 'text' : 'email', p.smsConsent, p.smsConsent ? stamp : null, p.smsConsent ? 'intake form' : null, 'America/New_York', stamp, stamp]),
      t,
    );
    const patientRows = await this.select<{ id: number; email: string; first_name: string; last_name: string; date_of_birth: string }>(
      "SELECT id, email, first_name, last_name, DATE_FORMAT(date_of_birth, '%Y-%m-%d') AS date_of_birth FROM patients WHERE practice_id = :practiceId AND email LIKE '%@example.com'",
      { practiceId },
      t,
    );
    const patientKey = (p: { firstName: string; lastName: string; dateOfBirth: string; email: string }) => `${p.firstName}|${p.lastName}|${p.dateOfBirth}|${p.email}`;
    const patientIds = new Map(patientRows.map((r) => [`${r.first_name}|${r.last_name}|${r.date_of_birth}|${r.email}`, r.id]));
    const pid = h.patients.map((p) => patientIds.get(patientKey(p))!);

    // Referrals are matched back by patient (each generated patient has one referral).
    await this.insert(
      'referrals',
      ['practice_id', 'patient_id', 'referring_dentist_id', 'location_id', 'received_on', 'urgency', 'procedure', 'reason', 'status', 'status_reason', 'status_changed_at', 'created_at', 'updated_at'],
      h.referrals.map((r) => {
        const first = r.events[0]!.at;
        const last = r.events[r.events.length - 1]!.at;
        return [practiceId, pid[r.patient], r.dentistId, r.locationId, r.receivedOn, r.urgency, r.procedure, 'Referred for treatment (demo history)', r.status, r.statusReason, sqlTime(last), sqlTime(first), sqlTime(last)];
      }),
      t,
    );
    const refRows = await this.select<{ id: number; patient_id: number }>('SELECT id, patient_id FROM referrals WHERE practice_id = :practiceId AND patient_id IN (:ids)', { practiceId, ids: pid }, t);
    const refByPatient = new Map(refRows.map((r) => [r.patient_id, r.id]));
    const rid = h.referrals.map((r) => refByPatient.get(pid[r.patient]!)!);
    await this.insert(
      'referral_status_events',
      ['practice_id', 'referral_id', 'status', 'reason', 'by_user_id', 'by_name', 'at'],
      h.referrals.flatMap((r, i) => r.events.map((e) => [practiceId, rid[i], e.status, e.reason, null, 'Demo data', sqlTime(e.at)])),
      t,
    );
    await this.insert(
      'cases',
      ['practice_id', 'referral_id', 'tooth_fdi', 'procedure', 'status', 'assessment', 'estimate', 'table_version', 'level', 'estimated_minutes', 'visit_count', 'canals', 'operator_id', 'created_at', 'updated_at'],
      h.cases.map((c) => {
        const r = h.referrals[c.referral]!;
        const e = c.estimate;
        return [
          practiceId, rid[c.referral], c.toothFdi, c.procedure, c.status,
          e ? JSON.stringify(e.assessment) : null, e ? JSON.stringify(e) : null, e ? tableVersion : null, e?.level ?? null, e?.totalMinutes ?? null, e?.visits.length ?? null, e?.canals ?? null,
          c.operatorId, sqlTime(r.events[0]!.at), sqlTime(r.events[r.events.length - 1]!.at),
        ];
      }),
      t,
    );
    const caseRows = await this.select<{ id: number; referral_id: number }>('SELECT id, referral_id FROM cases WHERE practice_id = :practiceId AND referral_id IN (:ids)', { practiceId, ids: rid }, t);
    const caseByReferral = new Map(caseRows.map((c) => [c.referral_id, c.id]));
    const cid = h.cases.map((c) => caseByReferral.get(rid[c.referral]!)!);

    // Appointments: each its own series (booked one at a time), matched back by series id.
    const series = h.appointments.map(() => randomUUID());
    await this.insert(
      'appointments',
      ['practice_id', 'series_id', 'visit_index', 'case_id', 'referral_id', 'location_id', 'chair_id', 'operator_id', 'microscope_id', 'start', 'end', 'turnover_minutes', 'state', 'version',
        'confirmed_at', 'confirmed_via', 'cancelled_at', 'cancelled_by_name', 'cancel_reason', 'cancel_notice_hours', 'seated_at', 'dismissed_at', 'notes', 'created_at', 'updated_at'],
      h.appointments.map((a, i) => [
        practiceId, series[i], a.visitIndex, cid[a.case], rid[h.cases[a.case]!.referral], a.locationId, a.chairId, a.operatorId, a.microscopeId, sqlTime(a.start), sqlTime(a.end), a.turnoverMinutes, a.state,
        a.state === 'dismissed' ? 5 : 3, sqlTime(a.confirmedAt), a.confirmedVia, sqlTime(a.cancelledAt), a.state === 'cancelled' ? 'Demo data' : null, a.cancelReason, a.cancelNoticeHours,
        sqlTime(a.seatedAt), sqlTime(a.dismissedAt), 'Demo history', sqlTime(a.createdAt), sqlTime(a.dismissedAt ?? a.cancelledAt ?? a.start),
      ]),
      t,
    );
    const apptRows = await this.select<{ id: number; series_id: string }>("SELECT id, series_id FROM appointments WHERE practice_id = :practiceId AND notes = 'Demo history'", { practiceId }, t);
    const apptBySeries = new Map(apptRows.map((r) => [r.series_id, r.id]));
    const aid = series.map((s) => apptBySeries.get(s)!);

    // The booking guard's cells for every visit that still holds its chair, operator and microscope.
    const cells: unknown[][] = [];
    h.appointments.forEach((a, i) => {
      if (a.state !== 'dismissed') return;
      for (const c of visitCells({ start: a.start, end: a.end, turnoverMinutes: a.turnoverMinutes, chairId: a.chairId, operatorId: a.operatorId, microscopeId: a.microscopeId })) {
        cells.push([c.kind, c.resourceId, sqlTime(c.cellStart), practiceId, aid[i]]);
      }
    });
    await this.insert('appointment_cells', ['resource_kind', 'resource_id', 'cell_start', 'practice_id', 'appointment_id'], cells, t);

    const patientOf = (ai: number) => h.referrals[h.cases[h.appointments[ai]!.case]!.referral]!;
    await this.insert(
      'outbox_messages',
      ['practice_id', 'channel', 'purpose', 'dedupe_key', 'rule_id', 'appointment_id', 'patient_id', 'referral_id', 'to_address', 'body', 'status', 'due_at', 'planned_at', 'attempts', 'sent_at', 'created_at', 'updated_at'],
      h.reminders.map((r) => {
        const ref = patientOf(r.appointment);
        const p = h.patients[ref.patient]!;
        const at = sqlTime(r.sentAt);
        const a = h.appointments[r.appointment]!;
        const body = this.historyText(r.ruleId, aid[r.appointment]!, a.start, names.practice, names.locations.get(a.locationId)!);
        return [practiceId, 'sms', 'reminder', `appt:${aid[r.appointment]}:sms:${r.ruleId}`, r.ruleId, aid[r.appointment], pid[ref.patient], rid[h.cases[h.appointments[r.appointment]!.case]!.referral], p.phone,
          body, 'sent', at, at, 1, at, at, at];
      }),
      t,
    );
    await this.insert(
      'visit_history',
      ['practice_id', 'visit_date', 'tooth_fdi', 'procedure', 'tooth_group', 'canals', 'level', 'operator_id', 'estimated_minutes', 'actual_minutes', 'table_version', 'source', 'appointment_id', 'created_at', 'updated_at'],
      h.visits.map((v) => [practiceId, v.visitDate, v.toothFdi, v.procedure, v.toothGroup, v.canals, v.level, v.operatorId, v.estimatedMinutes, v.actualMinutes, tableVersion, 'visit', aid[v.appointment], stamp, stamp]),
      t,
    );
  }
}

function rank(name: string): number {
  const i = DENTIST_ORDER.indexOf(name);
  return i < 0 ? DENTIST_ORDER.length : i;
}
