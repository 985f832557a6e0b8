import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { AppointmentState, CaseCompletion, CaseCompletionView, EstimateResult } from '@ostium/shared';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';
import type { RequestUser } from '../common/context/request-context.js';
import { EstimatesService } from '../estimates/estimates.service.js';
import type { CaseRecord } from './case-record.types.js';
import { completionReportSubject, reportFileName, type CompletionReportFacts } from './completion-report-letter.util.js';
import { renderCompletionReportPdf } from './completion-report-pdf.util.js';
import { readiness, recallDates, type CaseVisit } from './completion.util.js';
import type { CompleteCaseDto } from './dto/complete-case.dto.js';
import { LettersService, type LetterParties } from './letters.service.js';
import { CaseCompletionRow } from './models/case-completion.model.js';
import type { LetterRow } from './models/letter.model.js';
import { STATUS_PATH } from './referral-status.util.js';
import { ReferralsService } from './referrals.service.js';

interface VisitRow {
  id: number;
  start: Date;
  end: Date;
  state: AppointmentState;
  endodontist: string;
  location_name: string;
  time_zone: string;
}

const CLOSED = ['declined', 'cancelled'];
const conflict = (message: string, field = 'status', errors?: { field: string; message: string }[]) =>
  new ConflictException({ message, errors: errors ?? [{ field, message }] });

/**
 * Completing a case (POST /api/cases/:id/completion): once its visits are done the endodontist writes
 * the findings and recall plan; the case and, when it was the last open tooth, the referral move to
 * completed; the completion report is queued as a letter. Reading visits here (rather than importing
 * the scheduling module, which sits above referrals) is one query on appointments.
 */
@Injectable()
export class CompletionService {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly referrals: ReferralsService,
    private readonly letters: LettersService,
    private readonly estimates: EstimatesService,
    @InjectModel(CaseCompletionRow) private readonly completions: typeof CaseCompletionRow,
  ) {}

  /** Every visit of the case in any state, with who treated it and the location's zone. */
  async caseVisits(practiceId: number, caseId: number, transaction?: Transaction): Promise<CaseVisit[]> {
    const rows = await this.sequelize.query<VisitRow>(
      `SELECT a.id, a.start, a.end, a.state, u.name AS endodontist, l.name AS location_name, l.time_zone
         FROM appointments a JOIN users u ON u.id = a.operator_id JOIN locations l ON l.id = a.location_id
        WHERE a.practice_id = :practiceId AND a.case_id = :caseId
        ORDER BY a.start, a.id`,
      { replacements: { practiceId, caseId }, type: QueryTypes.SELECT, transaction },
    );
    return rows.map((r) => ({
      appointmentId: Number(r.id),
      start: new Date(r.start),
      end: new Date(r.end),
      state: r.state,
      endodontist: r.endodontist,
      locationName: r.location_name,
      timeZone: r.time_zone,
    }));
  }

  /** The recall months the form starts with: the stored estimate's, else the current table's for the procedure. */
  private async defaultRecall(c: CaseRecord, transaction?: Transaction): Promise<number[]> {
    const fromEstimate = (c.estimate as EstimateResult | null)?.recallMonths;
    if (Array.isArray(fromEstimate)) return [...fromEstimate];
    const table = await this.estimates.currentTable(c.practiceId, transaction);
    return table.recall.procedures.includes(c.procedure) ? [...table.recall.months] : [];
  }

  async view(practiceId: number, caseId: number, now = new Date()): Promise<CaseCompletionView> {
    const c = await this.referrals.getCase(practiceId, caseId);
    const [visits, row, parties, defaults] = await Promise.all([
      this.caseVisits(practiceId, caseId),
      this.completions.findOne({ where: { practiceId, caseId } }),
      this.letters.parties(practiceId, c.referralId),
      this.defaultRecall(c),
    ]);
    const ready = readiness(visits, now);
    let completion: CaseCompletion | null = null;
    if (row) {
      completion = {
        findings: row.findings,
        recallPlan: recallDates(row.treatmentEndedOn, row.recallMonths),
        sendReport: row.sendReport,
        treatmentEndedOn: row.treatmentEndedOn,
        completedAt: row.completedAt.toISOString(),
        completedBy: row.completedByName,
        report: row.reportLetterId ? await this.letters.summary(practiceId, row.reportLetterId) : null,
      };
    }
    // Completed, the form may still be sent again while the report has not gone (none asked for, failed, skipped).
    const reportGone = completion?.report && (completion.report.status === 'queued' || completion.report.status === 'sent') ? completion.report.status : null;
    const blockedBy = CLOSED.includes(c.status)
      ? `The case is ${c.status}`
      : reportGone
        ? `The completion report was already ${reportGone}`
        : completion
          ? null
          : ready.blockedBy;
    return {
      caseId: c.id,
      referralId: c.referralId,
      caseStatus: c.status,
      timeZone: parties?.location.timeZone ?? visits[0]?.timeZone ?? 'UTC',
      visits: ready.visits,
      openVisits: ready.openVisits,
      canComplete: blockedBy === null,
      blockedBy,
      defaultRecallPlan: defaults,
      completion,
    };
  }

  /**
   * Completes the case, or (when it is completed and its report did not go: none asked for, failed or
   * skipped) changes what was saved and queues the report again. One transaction: completion row, case
   * and referral status (through the referral's path, with history and audit), the report letter and
   * its outbox row.
   */
  async complete(user: RequestUser, caseId: number, dto: CompleteCaseDto, now = new Date()): Promise<CaseCompletionView> {
    const practiceId = user.practiceId;
    const actor = { id: user.id, name: user.name };
    try {
      await this.sequelize.transaction(async (t) => {
        const c = await this.referrals.getCase(practiceId, caseId, t);
        if (CLOSED.includes(c.status)) throw conflict(`The case is ${c.status}; it cannot be completed`);
        const existing = await this.completions.findOne({ where: { practiceId, caseId }, transaction: t, lock: t.LOCK.UPDATE });
        if (existing?.reportLetterId) {
          const report = await this.letters.summary(practiceId, existing.reportLetterId, t);
          if (report && (report.status === 'queued' || report.status === 'sent')) {
            throw conflict(`The completion report was already ${report.status}; the completion can no longer change`);
          }
        }
        const ready = readiness(await this.caseVisits(practiceId, caseId, t), now);
        if (!ready.canComplete && !existing) {
          throw conflict(ready.blockedBy!, 'visits', ready.openVisits.length ? ready.openVisits.map((o) => ({ field: 'visits', message: o.description })) : undefined);
        }
        const parties = await this.letters.parties(practiceId, c.referralId, t);
        if (!parties) throw new NotFoundException(`Referral ${c.referralId} not found`);
        const sendReport = dto.sendReport ?? true;
        const row = existing ?? this.completions.build({ practiceId, caseId, referralId: c.referralId });
        row.set({
          findings: dto.findings.trim(),
          recallMonths: [...new Set(dto.recallPlan ?? (await this.defaultRecall(c, t)))].sort((a, b) => a - b),
          treatmentEndedOn: ready.treatmentEndedOn ?? existing!.treatmentEndedOn,
          sendReport,
          completedBy: user.id,
          completedByName: user.name,
          completedAt: now,
        });
        if (!existing) await this.markCompleted(c, actor, now, t);
        if (sendReport) {
          const { letter } = await this.letters.queue(
            { practiceId, referralId: c.referralId, caseId, kind: 'completion_report', dentist: parties.dentist, subject: completionReportSubject(parties.practice.name), at: now, createdBy: user.id },
            t,
          );
          row.reportLetterId = letter.id;
        }
        await row.save({ transaction: t });
      });
    } catch (e) {
      // Two completions of one case at once: the unique case_id lets the first win.
      if (e instanceof UniqueConstraintError) throw conflict('The case was completed a moment ago; reload it');
      throw e;
    }
    return this.view(practiceId, caseId, now);
  }

  /** The case to completed; the referral too (one step at a time along its path) once no open tooth is left. */
  private async markCompleted(c: CaseRecord, actor: { id: number; name: string }, now: Date, t: Transaction) {
    const completed = STATUS_PATH.indexOf('completed');
    if (STATUS_PATH.indexOf(c.status) < completed) await this.referrals.updateCase(c.practiceId, c.id, { status: 'completed', updatedBy: actor.id }, t);
    const cases = await this.referrals.casesOf(c.practiceId, c.referralId, t);
    const open = cases.filter((x) => !CLOSED.includes(x.status));
    if (!open.every((x) => STATUS_PATH.indexOf(x.status) >= completed)) return;
    const at = STATUS_PATH.indexOf(c.referralStatus);
    if (at < 0) throw conflict(`The referral is ${c.referralStatus}; its case cannot be completed`);
    for (const status of STATUS_PATH.slice(at + 1, completed + 1)) {
      await this.referrals.setStatus(c.practiceId, c.referralId, status, { actor, reason: status === 'completed' ? 'Treatment completed' : null, transaction: t, at: now });
    }
  }

  /**
   * Once the report has gone: the case to report_sent, and the referral too when every open tooth's
   * report has gone (the referral is then completed). Idempotent.
   */
  async markReportSent(letter: LetterRow, t: Transaction, at: Date): Promise<void> {
    if (!letter.caseId) return;
    const actor = { id: null, name: 'Letters (report e-mailed)' };
    const c = await this.referrals.getCase(letter.practiceId, letter.caseId, t);
    if (c.status === 'completed') await this.referrals.updateCase(c.practiceId, c.id, { status: 'report_sent' }, t);
    const open = (await this.referrals.casesOf(c.practiceId, c.referralId, t)).filter((x) => !CLOSED.includes(x.status));
    if (c.referralStatus === 'completed' && open.every((x) => x.status === 'report_sent')) {
      await this.referrals.setStatus(c.practiceId, c.referralId, 'report_sent', { actor, reason: 'Completion report e-mailed to the referring dentist', transaction: t, at });
    }
  }

  /**
   * Everything the completion report says, as it is now: the saved findings and recall plan, the
   * dismissed visits, the parties. Null when the letter's case has no completion.
   */
  async reportFacts(letter: LetterRow, parties: LetterParties, now = new Date()): Promise<CompletionReportFacts | null> {
    if (!letter.caseId) return null;
    const [row, c, visits] = await Promise.all([
      this.completions.findOne({ where: { practiceId: letter.practiceId, caseId: letter.caseId } }),
      this.referrals.getCase(letter.practiceId, letter.caseId),
      this.caseVisits(letter.practiceId, letter.caseId),
    ]);
    if (!row) return null;
    return {
      practice: parties.practice,
      location: { name: parties.location.name, address: parties.location.address, phone: parties.location.phone, timeZone: parties.location.timeZone },
      dentist: { name: parties.dentist.name, practiceName: parties.dentist.practiceName },
      patient: { firstName: parties.patient.firstName, lastName: parties.patient.lastName, dateOfBirth: parties.patient.dateOfBirth },
      toothFdi: c.toothFdi,
      procedure: c.procedure,
      referralReceivedOn: parties.referral.receivedOn,
      visits: readiness(visits, now).visits.map((v) => ({ date: v.date, startTime: v.startTime, endTime: v.endTime, endodontist: v.endodontist })),
      treatmentEndedOn: row.treatmentEndedOn,
      recall: recallDates(row.treatmentEndedOn, row.recallMonths),
      findings: row.findings,
      completedBy: row.completedByName,
      issuedAt: letter.at.toISOString(),
    };
  }

  /**
   * A completion report's PDF: rendered from what the letter said when it was composed for sending (the
   * same facts give the same bytes), or — still queued and not yet composed — from what it would say now.
   */
  async letterPdf(practiceId: number, letterId: number): Promise<{ fileName: string; content: Buffer }> {
    const l = await this.letters.find(practiceId, letterId);
    if (!l) throw new NotFoundException(`Letter ${letterId} not found`);
    if (l.kind !== 'completion_report') throw new NotFoundException(`Letter ${letterId} is ${l.kind.replace('_', ' ')}; only a completion report has a PDF`);
    let facts = (l.content as { facts?: CompletionReportFacts } | null)?.facts ?? null;
    if (!facts) {
      const parties = await this.letters.parties(practiceId, l.referralId);
      facts = parties ? await this.reportFacts(l, parties) : null;
    }
    if (!facts) throw new NotFoundException(`Letter ${letterId}: the case has no completion`);
    return { fileName: reportFileName(facts), content: await renderCompletionReportPdf(facts) };
  }

  /** The first visit of a case still to come or done (cancelled and no-show ones left out), and how many there are. */
  async firstVisit(practiceId: number, caseId: number): Promise<{ visit: CaseVisit; count: number } | null> {
    const active = (await this.caseVisits(practiceId, caseId)).filter((v) => v.state !== 'cancelled' && v.state !== 'no_show');
    return active.length ? { visit: active[0]!, count: active.length } : null;
  }
}
