/**
 * Answers shaped as the API sends them (shared/api/customers.ts, machines.ts, readings.ts,
 * line-items.ts), for the customers, machine and reminders pages. Names from PRODUCT.md's
 * invented scenario.
 */
import type { Customer } from '../../shared/api/customers';
import type { LineItem } from '../../shared/api/line-items';
import type { Machine, MachineHistory } from '../../shared/api/machines';
import type { Reading } from '../../shared/api/readings';
import type { DueItem } from '../../shared/api/reminders';
import type { ServiceInterval } from '../../shared/api/service-intervals';

/** 1 psi = 6.894 757 293 168 kPa (NIST SP 811, Appendix B.8). */
export const KPA_PER_PSI = 6.894757293168;

export const jules: Customer = {
  id: 1,
  name: 'Jules Marchetti',
  email: 'jules@example.test',
  phone: '555-0101',
  addressLines: ['12 Larkspur Lane'],
  town: 'Cinder Valley',
  notes: 'Gate code 4411',
  archivedAt: null,
  createdAt: '2026-10-04T14:00:00.000Z',
  updatedAt: '2026-10-04T14:00:00.000Z',
};

export const rowan: Customer = {
  ...jules,
  id: 2,
  name: 'Rowan Delacroix',
  email: 'rowan@example.test',
  phone: '555-0102',
  addressLines: ['388 Old Flume Road'],
  town: 'Ashgrove Flats',
  notes: null,
};

/** The customer's own view of their record: staff notes are left out (null) by the server. */
export const julesAsCustomer: Customer = { ...jules, notes: null };

/**
 * A motorcycle with two specs from its manual (40 psi lowest, 30 L/h) and the rest generic.
 * The generic figures are the server's (shared/procedures/specs.ts): 39 and 47 psi, 3 psi, 5 min.
 */
export const quillback: Machine = {
  id: 1,
  customerId: 1,
  kind: 'motorcycle',
  year: 2019,
  make: 'Kestrel',
  model: 'Quillback 650',
  vin: '1M8GDM9AXKP042788',
  otherId: null,
  modelYears: [1989, 2019],
  meterUnit: 'mi',
  meterReading: 18420,
  meterReadAt: '2026-11-13T18:00:00.000Z',
  fuelPressureMinKpa: 40 * KPA_PER_PSI,
  fuelPressureMaxKpa: null,
  holdMaxDropKpa: null,
  holdMinutes: null,
  flowMinLph: 30,
  specs: {
    fuelPressureMinKpa: { value: 40 * KPA_PER_PSI, source: 'manual', genericValue: 39 * KPA_PER_PSI },
    fuelPressureMaxKpa: { value: 47 * KPA_PER_PSI, source: 'generic', genericValue: 47 * KPA_PER_PSI },
    holdMaxDropKpa: { value: 3 * KPA_PER_PSI, source: 'generic', genericValue: 3 * KPA_PER_PSI },
    holdMinutes: { value: 5, source: 'generic', genericValue: 5 },
    flowMinLph: { value: 30, source: 'manual', genericValue: 30 },
  },
  specsNote: null,
  notes: 'Keeps it in the back shed',
  archivedAt: null,
  createdAt: '2026-10-04T14:00:00.000Z',
  updatedAt: '2026-10-04T14:00:00.000Z',
};

export const larch: Machine = {
  ...quillback,
  id: 2,
  kind: 'atv',
  year: 2021,
  make: 'Tamarack',
  model: 'Larch 570',
  vin: null,
  otherId: 'TLA-570-220917',
  modelYears: [],
  meterUnit: 'h',
  meterReading: 312,
};

export const quillbackHistory: MachineHistory = {
  machineId: 1,
  meterUnit: 'mi',
  jobs: [
    {
      id: 40,
      status: 'invoiced',
      complaint: 'Stumbles and hesitates when opening the throttle.',
      diagnosis: 'Pump saw well under battery voltage; corroded ground at the frame.',
      workDone: 'Cleaned and re-made the frame ground.',
      scheduledAt: '2026-11-13T16:00:00.000Z',
      completedAt: '2026-11-13T18:30:00.000Z',
      meterReading: 18418,
      checks: [
        {
          id: 35,
          procedureKey: 'fuel-delivery',
          status: 'finished',
          verdict: 'fail',
          startedAt: '2026-11-13T16:20:00.000Z',
          finishedAt: '2026-11-13T17:00:00.000Z',
        },
      ],
    },
  ],
};

export const job40Readings: { items: Reading[]; nextCursor: null } = {
  items: [
    {
      id: 297,
      jobId: 40,
      quantity: 'voltage',
      value: 10.25,
      unit: 'V',
      enteredValue: 10.25,
      enteredUnit: 'V',
      takenAt: '2026-11-13T16:48:00.000Z',
      note: 'Voltage at the pump',
      stepKey: null,
      checkRunId: 35,
      clientId: null,
      judgement: {
        verdict: 'fail',
        reason: '10.25 V at the pump during prime, battery 12.65 V: voltage drop in the wiring.',
        specSource: null,
        basis: 'step',
      },
      createdAt: '2026-11-13T16:48:00.000Z',
    },
  ],
  nextCursor: null,
};

export const job40Lines: { items: LineItem[]; nextCursor: null } = {
  items: [
    {
      id: 108,
      jobId: 40,
      kind: 'labour',
      description: 'Voltage-drop test and ground repair',
      partNumber: null,
      quantity: 1,
      quantityMilli: 1000,
      unitPriceCents: 9500,
      markupBps: 0,
      taxable: false,
      position: 0,
      checkRunId: null,
      lineTotalCents: 9500,
      needsPrice: false,
      createdAt: '2026-11-13T17:00:00.000Z',
      updatedAt: '2026-11-13T17:00:00.000Z',
    },
  ],
  nextCursor: null,
};

export const quillbackIntervals: { items: ServiceInterval[]; nextCursor: null } = {
  items: [
    {
      id: 1,
      machineId: 1,
      item: 'fuel_filter',
      label: 'Fuel filter',
      everyKm: 8000,
      everyHours: null,
      everyMonths: 12,
      lastDoneOn: '2025-10-10',
      lastDoneMeter: 13870,
      meterUnit: 'mi',
      source: 'manual',
      state: {
        asOf: '2026-11-18',
        status: 'overdue',
        verdict: 'fail',
        reason: 'Overdue: overdue by 39 days (was due on 2026-10-10), whichever comes first',
        dueBy: 'months',
        dueOn: '2026-10-10',
        dueAtMeter: 18841,
        remainingDays: -39,
        remainingMeter: 421,
      },
      createdAt: '2026-10-04T14:00:00.000Z',
      updatedAt: '2026-10-04T14:00:00.000Z',
    },
  ],
  nextCursor: null,
};

export function dueItem(overrides: Partial<DueItem> = {}): DueItem {
  return {
    serviceIntervalId: 28,
    asOf: '2026-11-18',
    machine: { id: 13, make: 'Tamarack', model: 'Sprucewood 700', meterUnit: 'mi' },
    customer: { id: 9, name: 'Hollis Pike', email: 'hollis@example.test' },
    item: 'fuel_filter',
    label: 'Fuel filter',
    status: 'overdue',
    verdict: 'fail',
    reason: 'Overdue: overdue by 39 days (was due on 2026-10-10); 421 mi to go, whichever comes first',
    dueBy: 'months',
    dueOn: '2026-10-10',
    dueAtMeter: 8061,
    remaining: { days: -39, meter: 421 },
    reminder: null,
    ...overrides,
  };
}

export const list = <T>(items: T[], nextCursor: string | null = null) => ({ items, nextCursor });
