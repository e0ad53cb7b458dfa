import { useMutation, useQueryClient } from '@tanstack/react-query';
import { machinePath, MACHINES_PATH, MachineSchema } from '../../../../shared/api/machines';
import type { CreateMachineBody, UpdateMachineBody } from '../../../../shared/api/machines';
import {
  serviceIntervalsPath,
  ServiceIntervalSchema,
  type CreateServiceIntervalInput,
  type UpdateServiceIntervalInput,
} from '../../../../shared/api/service-intervals';
import { jsonInit, request } from '../../../lib/api-client';
import { machineQueries } from './queries';

/** A new machine joins the machine lists (its customer's, and any search it matches). */
export function useCreateMachine() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateMachineBody) => request(MACHINES_PATH, MachineSchema, jsonInit('POST', input)),
    onSuccess: (machine) => {
      queryClient.setQueryData(machineQueries.detail(machine.id).queryKey, machine);
      return queryClient.invalidateQueries({ queryKey: machineQueries.lists() });
    },
  });
}

/**
 * The saved machine replaces the cached one and the lists re-read. A new meter reading moves
 * what is due, so the machine's intervals are judged again; its history holds no machine fields.
 */
export function useUpdateMachine(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateMachineBody) =>
      request(machinePath(id), MachineSchema, jsonInit('PATCH', input)),
    onSuccess: (machine, input) => {
      queryClient.setQueryData(machineQueries.detail(id).queryKey, machine);
      const stale = [queryClient.invalidateQueries({ queryKey: machineQueries.lists() })];
      if (input.meterReading !== undefined) {
        stale.push(queryClient.invalidateQueries({ queryKey: machineQueries.intervals(id).queryKey }));
      }
      return Promise.all(stale);
    },
  });
}

/** A new service interval joins the machine's list, judged by the server as it stands today. */
export function useCreateServiceInterval(machineId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateServiceIntervalInput) =>
      request(serviceIntervalsPath(machineId), ServiceIntervalSchema, jsonInit('POST', input)),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: machineQueries.intervals(machineId).queryKey }),
  });
}

export type ServiceDone = { intervalId: number } & Pick<UpdateServiceIntervalInput, 'lastDoneOn' | 'lastDoneMeter'>;

/**
 * A service recorded done: the server judges the interval afresh and closes the reminder of the
 * round it ends. The machine's intervals re-read here; the route says what else went stale.
 */
export function useRecordServiceDone(machineId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ intervalId, ...input }: ServiceDone) =>
      request(`${serviceIntervalsPath(machineId)}/${intervalId}`, ServiceIntervalSchema, jsonInit('PATCH', input)),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: machineQueries.intervals(machineId).queryKey }),
  });
}
