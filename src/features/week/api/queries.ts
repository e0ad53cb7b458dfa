import { queryOptions, useQuery } from '@tanstack/react-query';
import { WEEK_REPORT_PATH, WeekReportSchema } from '../../../../shared/api/reports';
import type { WeekReport } from '../../../../shared/api/reports';
import { request } from '../../../lib/api-client';

export function fetchWeekReport(start: string, signal?: AbortSignal): Promise<WeekReport> {
  const path = `${WEEK_REPORT_PATH}?${new URLSearchParams({ start })}`;
  return request(path, WeekReportSchema, signal ? { signal } : {});
}

export const weekQueries = {
  all: () => ['week'] as const,
  reports: () => [...weekQueries.all(), 'report'] as const,
  report: (start: string) =>
    queryOptions({
      queryKey: [...weekQueries.reports(), start] as const,
      queryFn: ({ signal }) => fetchWeekReport(start, signal),
    }),
};

export function useWeekReport(start: string) {
  return useQuery(weekQueries.report(start));
}
