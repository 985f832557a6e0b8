import { DEFAULT_ESTIMATE_TABLE, type EstimateTable, type EstimateTableInfo } from '@ostium/shared';

// The server's own default table (design/estimator.md), as GET /api/settings/estimate-table returns it.
export function table(version = 2): EstimateTable {
  return { ...structuredClone(DEFAULT_ESTIMATE_TABLE), version };
}

export function info(version = 2): EstimateTableInfo {
  const versions = Array.from({ length: version - 1 }, (_, i) => ({ version: version - i, createdAt: `2026-11-${String(20 + i).padStart(2, '0')}T09:00:00.000Z`, createdBy: 1 }));
  return { version, table: table(version), createdAt: versions[0]?.createdAt ?? null, createdBy: versions[0] ? 1 : null, versions };
}
