import { WeekReportSchema } from '../../shared/api/reports';
import type { MachineDue, WeekReport } from '../../shared/api/reports';

const fuelFilter = {
  customerId: 1,
  customerName: 'Jules Marchetti',
  item: 'fuel_filter',
  label: 'Fuel filter',
  meterUnit: 'mi',
} as const;

/** Service intervals in each of the three statuses, deciding by date, by miles and by hours. */
export const sampleMachinesDue: MachineDue[] = [
  {
    ...fuelFilter,
    machineId: 1,
    machine: 'Kestrel Quillback 650',
    serviceIntervalId: 1,
    status: 'overdue',
    dueBy: 'months',
    dueOn: '2026-10-10',
    dueAtMeter: 18841,
    reason: 'Overdue: overdue by 36 days (was due on 2026-10-10); 421 mi to go (due at 18841 mi)',
  },
  {
    machineId: 13,
    machine: 'Tamarack Sprucewood 700',
    customerId: 9,
    customerName: 'Hollis Pike',
    serviceIntervalId: 29,
    item: 'oil',
    label: 'Engine oil and filter',
    status: 'due',
    dueBy: 'distance',
    dueOn: '2026-12-10',
    dueAtMeter: 6072.6,
    meterUnit: 'mi',
    reason: 'Due: 3 mi to go (due at 6072.6 mi); 25 days to go (due on 2026-12-10)',
  },
  {
    machineId: 5,
    machine: 'Tamarack Sprucewood 1000',
    customerId: 3,
    customerName: 'Tess Brandvold',
    serviceIntervalId: 11,
    item: 'in_tank_strainer',
    label: 'In-tank strainer',
    status: 'due_soon',
    dueBy: 'hours',
    dueOn: null,
    dueAtMeter: 562,
    meterUnit: 'h',
    reason: 'Due soon: 22 h to go (due at 562 h)',
  },
];

/**
 * A week as GET /api/reports/week answers it, parsed by the shared schema so a drift in the
 * contract breaks this fixture rather than passing silently. The revenue by day adds up to the
 * revenue: 37 973 + 61 397 + 21 336 + 11 375 + 15 064 = 147 145 ¢.
 */
export const sampleReport: WeekReport = WeekReportSchema.parse({
  start: '2026-11-09',
  end: '2026-11-15',
  timezone: 'America/Denver',
  jobsDone: 8,
  hoursBilled: 6.25,
  revenueCents: 147_145,
  collectedCents: 78_552,
  revenueByDay: [
    { date: '2026-11-09', cents: 0 },
    { date: '2026-11-10', cents: 37_973 },
    { date: '2026-11-11', cents: 61_397 },
    { date: '2026-11-12', cents: 21_336 },
    { date: '2026-11-13', cents: 11_375 },
    { date: '2026-11-14', cents: 15_064 },
    { date: '2026-11-15', cents: 0 },
  ],
  unpaid: { count: 8, balanceCents: 170_979 },
  overdue: { count: 2, balanceCents: 23_834 },
  miles: 185.234,
  deductionCents: 13_429,
  checks: { pass: 3, warn: 1, fail: 5 },
  machinesDue: sampleMachinesDue,
  machinesDueTotal: sampleMachinesDue.length,
} satisfies WeekReport);

/** A week in which nothing happened, with nothing open and nothing due. */
export const quietReport: WeekReport = WeekReportSchema.parse({
  ...sampleReport,
  start: '2026-11-23',
  end: '2026-11-29',
  jobsDone: 0,
  hoursBilled: 0,
  revenueCents: 0,
  collectedCents: 0,
  revenueByDay: sampleReport.revenueByDay.map((day, i) => ({
    date: `2026-11-${String(23 + i).padStart(2, '0')}`,
    cents: 0,
  })),
  unpaid: { count: 0, balanceCents: 0 },
  overdue: { count: 0, balanceCents: 0 },
  miles: 0,
  deductionCents: 0,
  checks: { pass: 0, warn: 0, fail: 0 },
  machinesDue: [],
  machinesDueTotal: 0,
} satisfies WeekReport);
