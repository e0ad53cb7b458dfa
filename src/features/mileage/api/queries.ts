import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { WEEK_REPORT_PATH, WeekReportSchema } from '../../../../shared/api/reports';
import {
  TRIPS_EXPORT_PATH,
  TRIPS_PATH,
  TRIPS_SUMMARY_PATH,
  TripListSchema,
  TripSummarySchema,
} from '../../../../shared/api/trips';
import type { Trip } from '../../../../shared/api/trips';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

/** A tax year runs with the calendar year (IRS Publication 463 for a calendar-year filer). */
export function yearRange(year: number): { from: string; to: string } {
  const y = String(year).padStart(4, '0');
  return { from: `${y}-01-01`, to: `${y}-12-31` };
}

/** A screenful of trips; a busy week is a dozen. */
export const TRIP_PAGE_SIZE = 25;

export const mileageQueries = {
  all: () => ['mileage'] as const,
  trips: () => [...mileageQueries.all(), 'trips'] as const,
  tripList: (year: number) =>
    infiniteQueryOptions({
      queryKey: [...mileageQueries.trips(), year] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(TRIPS_PATH, { ...yearRange(year), limit: TRIP_PAGE_SIZE, cursor: pageParam }),
          TripListSchema,
          { signal },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
  summaries: () => [...mileageQueries.all(), 'summary'] as const,
  summary: (year: number) =>
    queryOptions({
      queryKey: [...mileageQueries.summaries(), year] as const,
      queryFn: ({ signal }) => request(listPath(TRIPS_SUMMARY_PATH, { year }), TripSummarySchema, { signal }),
    }),
  /** The week's miles and deduction come from the week report, the one API that totals a week. */
  weeks: () => [...mileageQueries.all(), 'week'] as const,
  week: (start: string) =>
    queryOptions({
      queryKey: [...mileageQueries.weeks(), start] as const,
      queryFn: ({ signal }) => request(listPath(WEEK_REPORT_PATH, { start }), WeekReportSchema, { signal }),
      select: (report) => ({
        start: report.start,
        end: report.end,
        miles: report.miles,
        deductionCents: report.deductionCents,
      }),
    }),
};

export function useTripList(year: number) {
  return useInfiniteQuery({ ...mileageQueries.tripList(year), select: itemsOf<Trip> });
}

export function useMileageSummary(year: number) {
  return useQuery(mileageQueries.summary(year));
}

export function useWeekMileage(start: string, enabled: boolean) {
  return useQuery({ ...mileageQueries.week(start), enabled });
}

/** The CSV download for a tax year; a plain link, so the browser saves it with the server's file name. */
export const mileageCsvPath = (year: number) => listPath(TRIPS_EXPORT_PATH, yearRange(year));
