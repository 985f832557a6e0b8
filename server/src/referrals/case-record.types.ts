import type { CaseSummary, EstimateFacts, EstimateResult, FactorKey, Level, ReferralStatus, Urgency } from '@ostium/shared';

/** Who did something: a signed-in user, or the system (seeds, jobs) with a name and no id. */
export interface Actor {
  id: number | null;
  name: string | null;
}

/** One case with everything the case sheet and booking need; server-side shape for other domains. */
export interface CaseRecord extends CaseSummary {
  practiceId: number;
  locationId: number;
  patientId: number;
  referralStatus: ReferralStatus;
  urgency: Urgency;
  receivedOn: string;
  assessment: Partial<Record<FactorKey, Level>> | null;
  facts: EstimateFacts | null;
  estimate: EstimateResult | null;
  tableVersion: number | null;
  /** The endodontist's adjustment as the case sheet stores it. */
  override: Record<string, unknown> | null;
  canals: number | null;
  operatorId: number | null;
  updatedBy: number | null;
  updatedAt: string;
}

/** What updateCase may change; `undefined` leaves a field as it is, `null` clears it. */
export type CasePatch = Partial<
  Pick<
    CaseRecord,
    | 'procedure'
    | 'status'
    | 'assessment'
    | 'facts'
    | 'estimate'
    | 'tableVersion'
    | 'override'
    | 'level'
    | 'estimatedMinutes'
    | 'visitCount'
    | 'canals'
    | 'operatorId'
    | 'updatedBy'
  >
>;
