import { can, type Role } from '@ostium/shared';

// The same capabilities the server checks on GET /api/estimates/accuracy and POST /api/visit-history/import.
export const canSeeAccuracy = (role: Role | null | undefined) => can(role, 'estimateAccuracy');
export const canImportHistory = (role: Role | null | undefined) => can(role, 'visitHistoryImport');
