import type {
  AttendanceReport,
  BacklogReport,
  BacklogWhatIfRequest,
  BacklogWhatIfResponse,
  ChairUseReport,
  EstimateAccuracyReport,
  OperatorUseReport,
  ReferralsReport,
  ReportName,
  ReportQuery,
} from '@ostium/shared';
import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** The answer of each GET /api/reports/<name> (server/src/reports). */
export interface ReportByName {
  'chair-use': ChairUseReport;
  'operator-use': OperatorUseReport;
  attendance: AttendanceReport;
  referrals: ReferralsReport;
  'estimate-accuracy': EstimateAccuracyReport;
  backlog: BacklogReport;
}

export const reportKeys = {
  all: ['reports'] as const,
  report: (name: ReportName, q: ReportQuery) => [...reportKeys.all, name, q] as const,
};

export const reportQuery = <N extends ReportName>(name: N, q: ReportQuery) =>
  queryOptions({
    queryKey: reportKeys.report(name, q),
    queryFn: ({ signal }) => api<ReportByName[N]>(`/reports/${name}`, { query: { ...q }, signal }),
    // Past figures change only as visits are recorded; a minute of reuse spares the database on filter flips.
    staleTime: 60_000,
  });

export const useReport = <N extends ReportName>(name: N, q: ReportQuery) => useQuery(reportQuery(name, q));

/** POST /api/reports/backlog/what-if: the forecast again with chair days and operator days added or removed per week. */
export const useBacklogWhatIf = () =>
  useMutation({ mutationFn: (body: BacklogWhatIfRequest) => api<BacklogWhatIfResponse>('/reports/backlog/what-if', { method: 'POST', body }) });
