import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { jobLineItemsPath, LineItemListSchema } from '../../../../shared/api/line-items';
import {
  machineHistoryPath,
  MachineHistorySchema,
  MachineListSchema,
  machinePath,
  MACHINES_PATH,
  MachineSchema,
} from '../../../../shared/api/machines';
import type { Machine } from '../../../../shared/api/machines';
import { jobReadingsPath, ReadingListSchema } from '../../../../shared/api/readings';
import { serviceIntervalsPath, ServiceIntervalListSchema } from '../../../../shared/api/service-intervals';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

export const MACHINE_PAGE_SIZE = 25;
/** The most the API gives at once (CONTRACT.md); a job's readings and lines fit in one page. */
const WHOLE_LIST = 100;

export type MachineFilter = {
  /** One customer's machines; left out, every machine the signed-in person may see. */
  customerId?: number;
  /** Make, model, VIN or other id, any part (shared/api/machines.ts). */
  q?: string;
};

export const machineQueries = {
  all: () => ['machines'] as const,
  lists: () => [...machineQueries.all(), 'list'] as const,
  list: (filter: MachineFilter) =>
    infiniteQueryOptions({
      queryKey: [
        ...machineQueries.lists(),
        { customerId: filter.customerId, q: filter.q?.trim() ?? '' },
      ] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(MACHINES_PATH, {
            customerId: filter.customerId,
            q: filter.q?.trim(),
            limit: MACHINE_PAGE_SIZE,
            cursor: pageParam,
          }),
          MachineListSchema,
          { signal },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
  details: () => [...machineQueries.all(), 'detail'] as const,
  detail: (id: number) =>
    queryOptions({
      queryKey: [...machineQueries.details(), id] as const,
      queryFn: ({ signal }): Promise<Machine> => request(machinePath(id), MachineSchema, { signal }),
    }),
  histories: () => [...machineQueries.all(), 'history'] as const,
  /** Every job on the machine with its checks; a job's readings and lines hang under it. */
  history: (id: number) =>
    queryOptions({
      queryKey: [...machineQueries.histories(), id] as const,
      queryFn: ({ signal }) => request(machineHistoryPath(id), MachineHistorySchema, { signal }),
    }),
  jobReadings: (machineId: number, jobId: number) =>
    queryOptions({
      queryKey: [...machineQueries.history(machineId).queryKey, 'job', jobId, 'readings'] as const,
      queryFn: ({ signal }) =>
        request(listPath(jobReadingsPath(jobId), { limit: WHOLE_LIST }), ReadingListSchema, { signal }),
    }),
  jobLineItems: (machineId: number, jobId: number) =>
    queryOptions({
      queryKey: [...machineQueries.history(machineId).queryKey, 'job', jobId, 'line-items'] as const,
      queryFn: ({ signal }) =>
        request(listPath(jobLineItemsPath(jobId), { limit: WHOLE_LIST }), LineItemListSchema, { signal }),
    }),
  intervals: (id: number) =>
    queryOptions({
      queryKey: [...machineQueries.all(), 'intervals', id] as const,
      queryFn: ({ signal }) =>
        request(listPath(serviceIntervalsPath(id), { limit: WHOLE_LIST }), ServiceIntervalListSchema, {
          signal,
        }),
    }),
};

export function useMachineList(filter: MachineFilter) {
  return useInfiniteQuery({ ...machineQueries.list(filter), select: itemsOf<Machine> });
}

export function useMachine(id: number) {
  return useQuery(machineQueries.detail(id));
}

export function useMachineHistory(id: number) {
  return useQuery(machineQueries.history(id));
}

/** Asked for only when a visit is opened: most visits in a long history are never looked into. */
export function useJobReadings(machineId: number, jobId: number) {
  return useQuery(machineQueries.jobReadings(machineId, jobId));
}

export function useJobLineItems(machineId: number, jobId: number) {
  return useQuery(machineQueries.jobLineItems(machineId, jobId));
}

export function useServiceIntervals(id: number) {
  return useQuery(machineQueries.intervals(id));
}
