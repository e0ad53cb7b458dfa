import { infiniteQueryOptions, queryOptions } from '@tanstack/react-query';
import { AttachmentListSchema, attachmentsPath } from '../../../../shared/api/attachments';
import { CustomerListSchema, CUSTOMERS_PATH } from '../../../../shared/api/customers';
import {
  JobDetailSchema,
  JobListSchema,
  JOBS_PATH,
  jobPath,
  type JobStatus,
} from '../../../../shared/api/jobs';
import { jobLineItemsPath, LineItemListSchema } from '../../../../shared/api/line-items';
import { MachineListSchema, MACHINES_PATH } from '../../../../shared/api/machines';
import { jobReadingsPath, ReadingListSchema } from '../../../../shared/api/readings';
import { EstimateListSchema, jobEstimatesPath } from '../../../../shared/api/estimates';
import { request } from '../../../lib/api-client';
import { businessSettingsQuery } from '../../../lib/business-settings';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

/** What the jobs table asks the server for; empty fields are left out of the request. */
export type JobFilters = {
  status?: JobStatus | undefined;
  customerId?: number | undefined;
  /** YYYY-MM-DD, on the scheduled day, both ends included. */
  from?: string | undefined;
  to?: string | undefined;
  q?: string | undefined;
};

export const JOBS_PAGE_SIZE = 25;

/** One job's records come in full: a job has tens of readings, not thousands. */
const RECORDS_LIMIT = 100;

export const jobQueries = {
  all: () => ['jobs'] as const,
  lists: () => [...jobQueries.all(), 'list'] as const,
  list: (filters: JobFilters) =>
    infiniteQueryOptions({
      queryKey: [...jobQueries.lists(), filters] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(JOBS_PATH, { ...filters, limit: JOBS_PAGE_SIZE, cursor: pageParam }),
          JobListSchema,
          {
            signal,
          },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
      select: itemsOf,
    }),
  details: () => [...jobQueries.all(), 'detail'] as const,
  /** The job and its timeline. Its records are separate queries, so adding a reading refetches only readings. */
  detail: (id: number) =>
    queryOptions({
      queryKey: [...jobQueries.details(), id] as const,
      queryFn: ({ signal }) => request(jobPath(id), JobDetailSchema, { signal }),
    }),
  estimates: (id: number) =>
    queryOptions({
      queryKey: [...jobQueries.details(), id, 'estimates'] as const,
      queryFn: ({ signal }) =>
        request(listPath(jobEstimatesPath(id), { limit: 20 }), EstimateListSchema, { signal }),
    }),
  /**
   * Readings and lines also come from a guided check walked on its own page: asked again each
   * time the job page opens (staleTime 0), so coming back from a check shows what it added.
   */
  readings: (id: number) =>
    queryOptions({
      staleTime: 0,
      queryKey: [...jobQueries.details(), id, 'readings'] as const,
      queryFn: ({ signal }) =>
        request(listPath(jobReadingsPath(id), { limit: RECORDS_LIMIT }), ReadingListSchema, { signal }),
    }),
  lineItems: (id: number) =>
    queryOptions({
      staleTime: 0,
      queryKey: [...jobQueries.details(), id, 'line-items'] as const,
      queryFn: ({ signal }) =>
        request(listPath(jobLineItemsPath(id), { limit: RECORDS_LIMIT }), LineItemListSchema, { signal }),
    }),
  attachments: (id: number) =>
    queryOptions({
      queryKey: [...jobQueries.details(), id, 'attachments'] as const,
      queryFn: ({ signal }) =>
        request(listPath(attachmentsPath(id), { limit: RECORDS_LIMIT }), AttachmentListSchema, { signal }),
    }),
  /** The rates a job's lines are priced and taxed with (owner and staff may read them). */
  business: businessSettingsQuery,
  /** Customers whose name, e-mail or phone contain `q`: the new-job form's picker. */
  customerSearch: (q: string) =>
    queryOptions({
      queryKey: [...jobQueries.all(), 'customer-search', q] as const,
      queryFn: ({ signal }) =>
        request(listPath(CUSTOMERS_PATH, { q, limit: 20 }), CustomerListSchema, { signal }),
    }),
  machinesOf: (customerId: number) =>
    queryOptions({
      queryKey: [...jobQueries.all(), 'machines-of', customerId] as const,
      queryFn: ({ signal }) =>
        request(listPath(MACHINES_PATH, { customerId, limit: 100 }), MachineListSchema, { signal }),
    }),
};
