import type { EstimateFacts, EstimateResult, FactorKey, Level, Procedure } from './estimates.types.js';
import type { ReferralStatus, Urgency } from './referrals.types.js';

export interface CaseOverride {
  minutesPerVisit: number[];
  reason: string;
  byUserId: number;
  byName: string;
  at: string;
}

export interface CaseChange {
  at: string;
  byName: string | null;
  fields: string[];
}

/** GET /api/cases/:id — one tooth's assessment, stored estimate and the endodontist's override. */
export interface CaseSheet {
  id: number;
  referralId: number;
  toothFdi: string;
  procedure: Procedure;
  status: ReferralStatus;
  patient: { id: number; name: string; dateOfBirth: string };
  referral: { id: number; urgency: Urgency; locationId: number; reason: string | null; receivedOn: string };
  canals: number | null;
  assessment: Partial<Record<FactorKey, Level>>;
  facts: EstimateFacts;
  operatorId: number | null;
  estimate: EstimateResult | null;
  tableVersion: number | null;
  override: CaseOverride | null;
  /** What booking uses: the override when there is one, else the estimate's visit minutes. */
  bookedMinutesPerVisit: number[] | null;
  history: CaseChange[];
  updatedAt: string;
}

/** PATCH /api/cases/:id — the server recomputes and stores the estimate on every save. */
export interface UpdateCaseSheetRequest {
  procedure?: Procedure;
  canals?: number | null;
  assessment?: Partial<Record<FactorKey, Level>>;
  facts?: EstimateFacts;
  operatorId?: number | null;
  /** Endodontists only: minutes for each visit of the plan, with a reason; null removes it. */
  override?: { minutesPerVisit: number[]; reason: string } | null;
  /** Saving the sheet marks the case planned. */
  markPlanned?: boolean;
}

export interface EstimateTableInfo {
  version: number;
  table: import('./estimates.types.js').EstimateTable;
  createdAt: string | null;
  createdBy: number | null;
  versions: { version: number; createdAt: string; createdBy: number | null }[];
}

export interface VisitHistoryImportResult {
  imported: number;
  accuracy: import('./estimates.types.js').CellAccuracy[];
}
