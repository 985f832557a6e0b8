import { BadRequestException, ForbiddenException, Injectable } from '@nestjs/common';
import { can, type CaseOverride, type CaseSheet, type EstimateResult } from '@ostium/shared';
import { AuditService } from '../audit/audit.service.js';
import type { RequestUser } from '../common/context/request-context.js';
import { EstimatesService } from '../estimates/estimates.service.js';
import { PatientsService } from '../patients/patients.service.js';
import type { CaseRecord } from '../referrals/case-record.types.js';
import { ReferralsService } from '../referrals/referrals.service.js';
import type { UpdateCaseSheetDto } from './dto/update-case-sheet.dto.js';

// Fields whose change is worth a line in the sheet's history (the audit log holds everything).
const SHOWN = new Set(['procedure', 'status', 'assessment', 'facts', 'canals', 'override', 'operatorId', 'tableVersion']);

@Injectable()
export class CaseSheetsService {
  constructor(
    private readonly referrals: ReferralsService,
    private readonly estimates: EstimatesService,
    private readonly patients: PatientsService,
    private readonly audit: AuditService,
  ) {}

  async get(practiceId: number, caseId: number): Promise<CaseSheet> {
    return this.sheet(practiceId, await this.referrals.getCase(practiceId, caseId));
  }

  /** Saves the assessment, recomputes and stores the estimate (with its table version), and the override. */
  async update(user: RequestUser, caseId: number, dto: UpdateCaseSheetDto): Promise<CaseSheet> {
    if (dto.override !== undefined && !can(user.role, 'casesAdjust')) {
      throw new ForbiddenException('Only an endodontist can adjust the chair time of a case');
    }
    const current = await this.referrals.getCase(user.practiceId, caseId);
    if (['completed', 'report_sent', 'declined', 'cancelled'].includes(current.status)) {
      throw new BadRequestException({ message: `The case is ${current.status}; its sheet can no longer change`, errors: [{ field: 'status', message: 'closed' }] });
    }
    const inputs = {
      toothFdi: current.toothFdi,
      procedure: dto.procedure ?? current.procedure,
      canals: dto.canals === undefined ? (current.canals ?? undefined) : (dto.canals ?? undefined),
      assessment: dto.assessment ?? current.assessment ?? {},
      facts: dto.facts ?? current.facts ?? {},
      operatorId: dto.operatorId === undefined ? (current.operatorId ?? undefined) : (dto.operatorId ?? undefined),
    };
    const est = await this.estimates.estimateFor(user.practiceId, inputs);
    // Only a case not yet booked becomes planned; a booked or started one keeps its status when its sheet changes.
    const marksPlanned = !!dto.markPlanned && ['received', 'triaged', 'planned'].includes(current.status);
    let override = (current.override as CaseOverride | null) ?? null;
    if (dto.override === null) override = null;
    else if (dto.override) {
      if (dto.override.minutesPerVisit.length !== est.visits.length) {
        throw new BadRequestException({
          message: `override.minutesPerVisit needs ${est.visits.length} value(s), one per visit of the plan`,
          errors: [{ field: 'override.minutesPerVisit', message: `needs ${est.visits.length} value(s)` }],
        });
      }
      override = { minutesPerVisit: dto.override.minutesPerVisit, reason: dto.override.reason.trim(), byUserId: user.id, byName: user.name, at: new Date().toISOString() };
    } else if (override && override.minutesPerVisit.length !== est.visits.length) {
      // The plan now has a different number of visits; the old adjustment no longer fits it.
      override = null;
    }
    await this.referrals.updateCase(user.practiceId, caseId, {
      procedure: inputs.procedure,
      canals: dto.canals === undefined ? current.canals : dto.canals,
      assessment: inputs.assessment,
      facts: inputs.facts,
      operatorId: dto.operatorId === undefined ? current.operatorId : dto.operatorId,
      estimate: est,
      tableVersion: est.tableVersion,
      level: est.level,
      estimatedMinutes: est.totalMinutes,
      visitCount: est.visits.length,
      override: override as unknown as Record<string, unknown> | null,
      updatedBy: user.id,
      ...(marksPlanned ? { status: 'planned' as const } : {}),
    });
    if (marksPlanned) await this.advanceReferral(user, current.referralId);
    return this.get(user.practiceId, caseId);
  }

  /** Reviewing a sheet triages the referral; once every case is planned, the referral is planned. */
  private async advanceReferral(user: RequestUser, referralId: number) {
    const actor = { id: user.id, name: user.name };
    let referral = await this.referrals.get(user.practiceId, referralId);
    if (referral.status === 'received') {
      await this.referrals.setStatus(user.practiceId, referralId, 'triaged', { actor });
      referral = await this.referrals.get(user.practiceId, referralId);
    }
    const open = referral.cases.filter((c) => !['declined', 'cancelled'].includes(c.status));
    if (referral.status === 'triaged' && open.length > 0 && open.every((c) => c.status === 'planned')) {
      await this.referrals.setStatus(user.practiceId, referralId, 'planned', { actor });
    }
  }

  private async sheet(practiceId: number, c: CaseRecord): Promise<CaseSheet> {
    const [patient, referral, log] = await Promise.all([
      this.patients.get(practiceId, c.patientId),
      this.referrals.get(practiceId, c.referralId),
      this.audit.list(practiceId, { entity: 'cases', entityId: String(c.id), pageSize: 100 }),
    ]);
    const override = (c.override as CaseOverride | null) ?? null;
    const estimate = (c.estimate as EstimateResult | null) ?? null;
    return {
      id: c.id,
      referralId: c.referralId,
      toothFdi: c.toothFdi,
      procedure: c.procedure,
      status: c.status,
      patient: { id: patient.id, name: `${patient.firstName} ${patient.lastName}`, dateOfBirth: patient.dateOfBirth },
      referral: { id: referral.id, urgency: referral.urgency, locationId: referral.location.id, reason: referral.reason, receivedOn: referral.receivedOn },
      canals: c.canals,
      assessment: c.assessment ?? {},
      facts: c.facts ?? {},
      operatorId: c.operatorId,
      estimate,
      tableVersion: c.tableVersion,
      override,
      bookedMinutesPerVisit: override?.minutesPerVisit ?? estimate?.visits.map((v) => v.minutes) ?? null,
      history: log.items
        .map((e) => ({ at: e.at, byName: e.userEmail, fields: Object.keys(e.after ?? e.before ?? {}).filter((k) => SHOWN.has(k)) }))
        .filter((h) => h.fields.length > 0),
      updatedAt: c.updatedAt,
    };
  }
}
