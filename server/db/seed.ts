/**
 * Demo data for a first start: six weeks of Ridgeback Mobile Moto's work ending on `today`.
 * Deterministic (a fixed pseudo-random sequence and dates derived from `today` only, so the same
 * day gives the same rows) and idempotent (a database that already has the demo business is left
 * alone). Written in one transaction: a crash mid-seed leaves nothing half-made.
 */
import { createHash } from 'node:crypto';
import { TZDate } from '@date-fns/tz';
import { eq, sql } from 'drizzle-orm';
import { invoiceTotals, type MoneyLine } from '../../shared/money';
import { withCheckDigit } from '../../shared/vin';
import { JOB_STATUSES, type JobStatus, type LineItemKind } from '../../shared/api/jobs';
import { round } from '../../shared/evaluators/types';
import { batteryCharging } from '../../shared/procedures/battery-charging';
import { compression } from '../../shared/procedures/compression';
import { startRun, walkRun, type RunState } from '../../shared/procedures/engine';
import { fuelDelivery } from '../../shared/procedures/fuel-delivery';
import { stepReadings } from '../../shared/procedures/readings';
import { GENERIC_FUEL_SPEC, type MachineSpec } from '../../shared/procedures/specs';
import type { ProcedureDefinition, StepAnswer } from '../../shared/procedures/types';
import { kpaToPsi, psiToKpa } from '../../shared/units';
import type { ServiceItem } from '../../shared/api/reminders';
import { hashPassword } from '../auth/password';
import type { Db } from './client';
import * as t from './schema';
import {
  DEMO_BUSINESS_SLUG,
  DEMO_PASSWORD,
  demoBusiness,
  demoCustomers,
  demoMachines,
  demoPlaces,
  demoUsers,
  storiesByKind,
  storyComplaints,
  type DemoMachine,
  type DemoSpecs,
  type JobStory,
} from './seed-data';

/**
 * The shared generic fuel limits in psi, to place a story's numbers for a machine without manual
 * values; the verdicts themselves come from the engine, which applies the same limits.
 */
const GENERIC_SPECS: DemoSpecs = {
  pressureMinPsi: round(kpaToPsi(GENERIC_FUEL_SPEC.fuelPressureMinKpa), 6),
  pressureMaxPsi: round(kpaToPsi(GENERIC_FUEL_SPEC.fuelPressureMaxKpa), 6),
  holdMaxDropPsi: round(kpaToPsi(GENERIC_FUEL_SPEC.holdMaxDropKpa), 6),
  holdMinutes: GENERIC_FUEL_SPEC.holdMinutes,
  flowMinLph: GENERIC_FUEL_SPEC.flowMinLph,
};

const DAY_MS = 86_400_000;

/** mulberry32: a small, well-known 32-bit generator; the same seed gives the same sequence. */
function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let x = Math.imul(a ^ (a >>> 15), a | 1);
    x ^= x + Math.imul(x ^ (x >>> 7), x | 61);
    return ((x ^ (x >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)] as T,
    round: (value: number, places: number) => Number(value.toFixed(places)),
  };
}

/**
 * Calendar days are held as UTC midnight of the date on the business's wall calendar, so date
 * arithmetic never crosses a DST change; `at` turns a day and a wall-clock time into the instant.
 */
function localDay(instant: Date): Date {
  const local = new TZDate(instant, demoBusiness.timezone);
  return new Date(Date.UTC(local.getFullYear(), local.getMonth(), local.getDate()));
}
const addDays = (day: Date, days: number) => new Date(day.getTime() + days * DAY_MS);
const at = (day: Date, hours: number, minutes = 0) =>
  new Date(
    new TZDate(
      day.getUTCFullYear(),
      day.getUTCMonth(),
      day.getUTCDate(),
      hours,
      minutes,
      demoBusiness.timezone,
    ).getTime(),
  );
const isoDate = (day: Date) => day.toISOString().slice(0, 10);

export interface SeedResult {
  seeded: boolean;
  businessId: number;
}

export async function seedDemo(db: Db, { today }: { today: Date }): Promise<SeedResult> {
  const existing = await db
    .select({ id: t.businesses.id })
    .from(t.businesses)
    .where(eq(t.businesses.slug, DEMO_BUSINESS_SLUG));
  if (existing[0]) return { seeded: false, businessId: existing[0].id };

  // Hash before the transaction: scrypt is slow on purpose and needs no lock.
  const passwordHashes = await Promise.all(
    demoUsers.map((user) => hashPassword(DEMO_PASSWORD, demoSalt(user.email))),
  );

  return db.transaction(async (tx) => {
    // Rows that describe the business itself are dated as if set up six weeks before today.
    const setUpAt = at(addDays(localDay(today), -45), 8);
    const stamps = { createdAt: setUpAt, updatedAt: setUpAt };
    const [business] = await tx
      .insert(t.businesses)
      .values({ ...demoBusiness, addressLines: [...demoBusiness.addressLines], ...stamps })
      .returning({ id: t.businesses.id });
    const businessId = business!.id;
    const rng = prng(0x5eed_2026);

    const customerIds = new Map<string, number>();
    for (const customer of demoCustomers) {
      const [row] = await tx
        .insert(t.customers)
        .values({
          businessId,
          name: customer.name,
          email: customer.email,
          phone: customer.phone,
          addressLines: [customer.address],
          town: customer.town,
          ...stamps,
        })
        .returning({ id: t.customers.id });
      customerIds.set(customer.key, row!.id);
    }

    const userIds = new Map<string, number>();
    for (const [i, user] of demoUsers.entries()) {
      const [row] = await tx
        .insert(t.users)
        .values({
          businessId,
          email: user.email,
          name: user.name,
          role: user.role,
          passwordHash: passwordHashes[i]!,
          customerId: user.customerKey ? customerIds.get(user.customerKey)! : null,
          ...stamps,
        })
        .returning({ id: t.users.id });
      userIds.set(user.role, row!.id);
    }
    const ownerId = userIds.get('owner')!;
    const customerUserFor = (customerKey: string) =>
      demoUsers.some((u) => u.customerKey === customerKey) ? userIds.get('customer')! : ownerId;
    const helperId = userIds.get('helper')!;

    const machineIds = new Map<string, number>();
    for (const machine of demoMachines) {
      const [row] = await tx
        .insert(t.machines)
        .values({
          businessId,
          customerId: customerIds.get(machine.customerKey)!,
          kind: machine.kind,
          year: machine.year,
          make: machine.make,
          model: machine.model,
          vin: machine.vinBody ? withCheckDigit(machine.vinBody.replace('_', '0')) : null,
          otherId: machine.otherId ?? null,
          meterUnit: machine.meterUnit,
          meterReading: machine.meterReading,
          meterReadAt: at(addDays(localDay(today), -45), 12),
          ...(machineSpec(machine) ?? {}),
          specsNote: machine.specs ? 'Entered from the service manual.' : null,
          ...stamps,
        })
        .returning({ id: t.machines.id });
      machineIds.set(machine.key, row!.id);
    }

    await seedServiceIntervals(tx, { businessId, machineIds, customerIds, today: localDay(today), setUpAt });

    const plan = planJobs(localDay(today), rng);
    let vanOdometer = 48_210.4;
    let lastTripDay = '';
    for (const planned of plan) {
      const machine = planned.machine;
      const customer = demoCustomers.find((c) => c.key === machine.customerKey)!;
      const scheduledAt = at(planned.day, planned.hour);
      const happened = planned.status !== 'booked';
      const done = ['complete', 'invoiced', 'paid'].includes(planned.status);
      const [job] = await tx
        .insert(t.jobs)
        .values({
          businessId,
          customerId: customerIds.get(machine.customerKey)!,
          machineId: machineIds.get(machine.key)!,
          status: planned.status,
          complaint: storyComplaints[planned.story],
          location: `${rng.pick(demoPlaces[customer.town] ?? ['customer driveway'])}, ${customer.town}`,
          scheduledAt,
          arrivedAt: happened && planned.status !== 'cancelled' ? at(planned.day, planned.hour, 12) : null,
          completedAt: done ? at(planned.day, planned.hour + 2, 30) : null,
          cancelledAt: planned.status === 'cancelled' ? at(addDays(planned.day, -1), 17) : null,
          meterReading: happened ? machine.meterReading - planned.ageDays * 0.4 : null,
          diagnosis: done ? storyDiagnosis[planned.story] : null,
          workDone: done ? storyWork[planned.story] : null,
          createdBy: ownerId,
          createdAt: at(addDays(planned.day, -3), 9),
          updatedAt: at(planned.day, planned.hour + 3),
        })
        .returning({ id: t.jobs.id });
      const jobId = job!.id;

      await tx.insert(t.jobEvents).values(
        statusTrail(planned.status).map((status, i, trail) => ({
          businessId,
          jobId,
          fromStatus: i === 0 ? null : trail[i - 1]!,
          toStatus: status,
          actorId: ownerId,
          at: i === 0 ? at(addDays(planned.day, -3), 9) : at(planned.day, planned.hour, 10 + i * 10),
        })),
      );

      const beyondArrival = !['booked', 'on_site', 'cancelled'].includes(planned.status);
      if (beyondArrival) {
        await seedCheck(tx, {
          businessId,
          jobId,
          story: planned.story,
          machine,
          start: at(planned.day, planned.hour, 20),
          actorId: planned.ageDays % 3 === 0 ? helperId : ownerId,
          rng,
          finished: planned.status !== 'diagnosing',
        });
      }
      const quoted = beyondArrival && planned.status !== 'diagnosing';
      const lines = quoted ? storyLines(planned.story, machine) : [];
      if (lines.length > 0) {
        await tx.insert(t.lineItems).values(
          lines.map((line, position) => ({
            businessId,
            jobId,
            position,
            kind: line.kind,
            description: line.description,
            partNumber: line.partNumber ?? null,
            quantityMilli: line.quantityMilli,
            unitPriceCents: line.unitPriceCents,
            markupBps: line.markupBps ?? 0,
            taxable: line.taxable,
            createdAt: at(planned.day, planned.hour + 1),
            updatedAt: at(planned.day, planned.hour + 1),
          })),
        );
      }
      if (planned.status === 'awaiting_approval' || planned.status === 'repairing') {
        await tx.insert(t.estimates).values({
          businessId,
          jobId,
          status: planned.status === 'repairing' ? 'approved' : 'sent',
          totalCents: invoiceTotals(lines, demoBusiness.taxRatePpm, 'per_invoice').totalCents,
          lines: lines.map(({ kind, description, quantityMilli, unitPriceCents }) => ({
            kind,
            description,
            quantityMilli,
            unitPriceCents,
          })),
          sentAt: at(planned.day, planned.hour + 1),
          decidedAt: planned.status === 'repairing' ? at(planned.day, planned.hour + 2) : null,
          decidedBy: planned.status === 'repairing' ? customerUserFor(machine.customerKey) : null,
          createdAt: at(planned.day, planned.hour + 1),
        });
      }
      if (happened && planned.status !== 'cancelled') {
        const miles = rng.int(60, 420) / 10;
        const tripDay = isoDate(planned.day);
        const tripStart = vanOdometer;
        vanOdometer = Number((vanOdometer + miles).toFixed(1));
        await tx.insert(t.trips).values({
          businessId,
          jobId,
          tripDate: tripDay,
          startOdometer: tripStart,
          endOdometer: vanOdometer,
          origin: lastTripDay === tripDay ? 'previous job' : 'home base, Cinder Valley',
          destination: `${customer.name}, ${customer.town}`,
          purpose: `Service call: ${machine.make} ${machine.model}`,
          startedAt: at(planned.day, planned.hour - 1, 15),
          endedAt: at(planned.day, planned.hour),
          createdBy: ownerId,
          createdAt: at(planned.day, planned.hour),
        });
        lastTripDay = tripDay;
        if (planned.tripFee) {
          lines.push(tripLine(miles));
          await tx.insert(t.lineItems).values({
            businessId,
            jobId,
            position: lines.length - 1,
            ...tripLine(miles),
            createdAt: at(planned.day, planned.hour + 1),
            updatedAt: at(planned.day, planned.hour + 1),
          });
        }
      }
      if (planned.status === 'invoiced' || planned.status === 'paid') {
        await seedInvoice(tx, {
          businessId,
          jobId,
          customerId: customerIds.get(machine.customerKey)!,
          lines,
          issuedDay: addDays(planned.day, 1),
          payment: planned.payment,
          ownerId,
          customerEmail: customer.email,
        });
      }
    }

    return { seeded: true, businessId };
  });
}

/** The demo users' salts come from their e-mail so the seed is byte-for-byte repeatable. */
function demoSalt(email: string): Buffer {
  return createHash('sha256').update(`vanbay-demo-salt:${email}`).digest().subarray(0, 16);
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

interface PlannedJob {
  day: Date;
  hour: number;
  ageDays: number;
  machine: DemoMachine;
  story: JobStory;
  status: JobStatus;
  /** How the invoice was settled, for invoiced/paid jobs. */
  payment: 'none' | 'card' | 'cash' | 'cheque' | 'part';
  tripFee: boolean;
}

/**
 * Six weeks back from today, Monday to Saturday, one or two jobs a day, plus two booked ahead.
 * Status follows age: today's jobs are under way, last week's are billed, older ones mostly paid,
 * with one cancelled, one part-paid and one overdue among them.
 */
function planJobs(today: Date, rng: ReturnType<typeof prng>): PlannedJob[] {
  const planned: PlannedJob[] = [];
  const machines = [...demoMachines];
  let turn = 0;
  for (let age = 41; age >= -2; age -= 1) {
    const day = addDays(today, -age);
    if (day.getUTCDay() === 0) continue; // Sunday off
    const count = age < 0 ? 1 : age % 4 === 0 ? 2 : 1;
    for (let n = 0; n < count; n += 1) {
      const machine = machines[turn % machines.length]!;
      const story =
        storiesByKind[machine.kind][Math.floor(turn / machines.length) % storiesByKind[machine.kind].length]!;
      turn += 1;
      planned.push({
        day,
        hour: n === 0 ? 9 : 13,
        ageDays: age,
        machine,
        story,
        status: 'booked',
        payment: 'none',
        tripFee: rng.next() < 0.6,
      });
    }
  }
  // Statuses by age, then the special cases placed deterministically.
  for (const job of planned) {
    job.status = statusForAge(job.ageDays, job.hour);
    if (job.status === 'paid')
      job.payment = job.ageDays % 3 === 0 ? 'card' : job.ageDays % 3 === 1 ? 'cash' : 'cheque';
  }
  // The last few days before today walk back through the workshop stages, newest first.
  const lastDays = planned.filter((job) => job.ageDays >= 1).reverse();
  (['repairing', 'awaiting_approval', 'complete', 'complete'] as const).forEach((status, i) => {
    lastDays[i]!.status = status;
  });
  const older = planned.filter((job) => job.ageDays >= 20);
  older[1]!.status = 'cancelled';
  older[1]!.payment = 'none';
  const overdue = older[3]!;
  overdue.status = 'invoiced';
  overdue.payment = 'none';
  const partPaid = older[5]!;
  partPaid.status = 'invoiced';
  partPaid.payment = 'part';
  // The two stories the demo must show whatever the rotation: a failing hold and a clogged filter.
  const recent = planned.filter(
    (job) => job.ageDays >= 1 && job.ageDays <= 8 && job.machine.kind !== 'small_engine',
  );
  recent[0]!.story = 'hold-fail';
  recent[1]!.story = 'clogged-filter';
  return planned;
}

function statusForAge(age: number, hour: number): JobStatus {
  // Today's morning job is being diagnosed; the afternoon one has only just been reached.
  if (age < 0) return 'booked';
  if (age === 0) return hour < 12 ? 'diagnosing' : 'on_site';
  if (age <= 10) return 'invoiced';
  return 'paid';
}

/** The normal path of a job, which JOB_STATUSES lists in order. */
const TRAIL = JOB_STATUSES.filter((status) => status !== 'cancelled');

function statusTrail(status: JobStatus): JobStatus[] {
  if (status === 'cancelled') return ['booked', 'cancelled'];
  return TRAIL.slice(0, TRAIL.indexOf(status) + 1);
}

const storyDiagnosis: Record<JobStory, string> = {
  'hold-fail': 'Pressure fell steadily after the pump stopped: the pump check valve is leaking back.',
  'clogged-filter':
    'Pressure dipped below spec under load and flow was weak: restricted fuel filter and strainer.',
  'no-prime-pump':
    'Battery voltage at the pump connector during prime but the pump did not run: pump failed.',
  'no-prime-relay': 'No voltage at the pump connector during prime; traced to a failed pump relay.',
  'low-voltage': 'Pump saw well under battery voltage; corroded ground at the frame.',
  'weak-battery': 'Battery at about a quarter charge after rest; would not hold a charge.',
  service: 'Routine service; no faults found.',
  'low-compression': 'Compression well under the expected figure; worn rings suspected.',
  'stale-fuel': 'Varnished fuel from storage; fuel system cleaned and refilled.',
};

const storyWork: Record<JobStory, string> = {
  'hold-fail': 'Replaced the fuel pump assembly; hold test re-run and passed.',
  'clogged-filter': 'Replaced the in-line filter and in-tank strainer; running pressure re-tested in spec.',
  'no-prime-pump': 'Replaced the fuel pump; prime run and pressure confirmed.',
  'no-prime-relay': 'Replaced the pump relay; prime run confirmed.',
  'low-voltage': 'Cleaned and re-made the frame ground; voltage at pump within 0.3 V of battery.',
  'weak-battery': 'Fitted a new battery and checked the charging voltage.',
  service: 'Oil and filter, plug check, fuel stabiliser added for storage.',
  'low-compression': 'Quoted a top-end rebuild; customer to decide.',
  'stale-fuel': 'Drained the tank, cleaned the fuel system, fresh fuel with stabiliser.',
};

interface SeedLine extends MoneyLine {
  kind: LineItemKind;
  description: string;
  partNumber?: string;
}

const labour = (hours: number, description: string): SeedLine => ({
  kind: 'labour',
  description,
  quantityMilli: Math.round(hours * 1000),
  unitPriceCents: demoBusiness.labourRateCents,
  taxable: false,
});
const part = (description: string, cents: number, partNumber: string, count = 1): SeedLine => ({
  kind: 'part',
  description,
  partNumber,
  quantityMilli: count * 1000,
  unitPriceCents: cents,
  markupBps: demoBusiness.partsMarkupBps,
  taxable: true,
});

function storyLines(story: JobStory, machine: DemoMachine): SeedLine[] {
  const partNo = (suffix: string) => `${machine.make.slice(0, 3).toUpperCase()}-${suffix}`;
  switch (story) {
    case 'hold-fail':
      return [
        labour(1.5, 'Fuel delivery check and pump replacement'),
        part('Fuel pump assembly', 18_900, partNo('FP210')),
      ];
    case 'clogged-filter':
      return [
        labour(1, 'Fuel delivery check; filter and strainer replacement'),
        part('In-line fuel filter', 2_450, partNo('FF044')),
        part('In-tank fuel strainer', 1_875, partNo('ST017')),
      ];
    case 'no-prime-pump':
      return [
        labour(1.25, 'No-prime diagnosis and pump replacement'),
        part('Fuel pump', 16_450, partNo('FP118')),
      ];
    case 'no-prime-relay':
      return [
        labour(0.75, 'No-prime diagnosis; circuit traced'),
        part('Fuel pump relay', 3_200, partNo('RL009')),
      ];
    case 'low-voltage':
      return [
        labour(1, 'Voltage-drop test and ground repair'),
        { ...part('Ring terminals and heat-shrink', 650, 'SUP-RT6'), kind: 'supplies' },
      ];
    case 'weak-battery':
      return [labour(0.5, 'Battery and charging test'), part('Battery, AGM 12 V', 11_900, partNo('BT14L'))];
    case 'service':
      return [
        labour(0.8, 'Season service'),
        part('Oil and filter kit', 4_800, partNo('SV100')),
        part('Fuel stabiliser', 1_100, 'SUP-FS1'),
      ];
    case 'low-compression':
      return [labour(0.6, 'Compression test and report')];
    case 'stale-fuel':
      return [labour(1.2, 'Fuel system clean after storage'), part('Fuel system cleaner', 1_400, 'SUP-FC2')];
  }
}

function tripLine(miles: number): SeedLine {
  const billable = Math.max(0, Math.ceil(miles) - demoBusiness.tripFeeFreeMiles);
  return {
    kind: 'trip',
    description: `Call-out, ${miles.toFixed(1)} mi`,
    quantityMilli: 1000,
    unitPriceCents: demoBusiness.tripFeeBaseCents + billable * demoBusiness.tripFeePerMileCents,
    taxable: false,
  };
}

interface CheckInput {
  businessId: number;
  jobId: number;
  story: JobStory;
  machine: DemoMachine;
  start: Date;
  actorId: number;
  rng: ReturnType<typeof prng>;
  finished: boolean;
}

type SeedAnswer = { stepKey: string; answer: StepAnswer };
type SeedAnswers = { procedure: ProcedureDefinition; answers: SeedAnswer[] };

const V = (value: number) => ({ value, unit: 'V' as const });
const psi = (value: number) => ({ value, unit: 'psi' as const });

/**
 * The answers a mechanic gave for each story, in the units typed at the roadside. The shared
 * engine walks them, so every stored verdict, reason and finding is the one the server's
 * re-check derives.
 */
function storyAnswers(story: JobStory, spec: DemoSpecs, rng: ReturnType<typeof prng>): SeedAnswers | null {
  const mid = (spec.pressureMinPsi + spec.pressureMaxPsi) / 2;
  const bat = rng.round(12.5 + rng.next() * 0.2, 2);
  const holdSeries = (peak: number, leakPsiPerMin: number) => ({
    points: {
      unit: 'psi' as const,
      points: [0, 30, 60, 120, 180, 240, 300].map((sec) => {
        const settle = sec >= 30 ? 1 : 0; // the normal small drop right after the pump stops
        const leak = sec > 30 ? ((sec - 30) / 60) * leakPsiPerMin : 0;
        return { sec, value: rng.round(peak - settle - leak, 1) };
      }),
    },
  });
  const symptoms: Partial<Record<JobStory, string[]>> = {
    'hold-fail': ['long_cranking'],
    'clogged-filter': ['cuts_out_under_load', 'stumbles_on_acceleration'],
    'no-prime-pump': ['no_start'],
    'no-prime-relay': ['no_start'],
    'low-voltage': ['no_start'],
    'stale-fuel': ['stumbles_on_acceleration'],
  };
  const basics = (fuel: string): SeedAnswer[] => [
    { stepKey: 'symptoms', answer: { symptoms: symptoms[story] ?? [] } },
    { stepKey: 'basics-battery', answer: { batteryType: 'flooded', volts: V(bat) } },
    { stepKey: 'basics-fuel', answer: { fuel } },
    { stepKey: 'basics-air-filter', answer: { airFilter: 'clean' } },
    { stepKey: 'basics-fault-codes', answer: { faultCodes: 'none' } },
    { stepKey: 'basics-engine', answer: { engine: 'confirmed' } },
  ];
  const primed: SeedAnswer = {
    stepKey: 'prime-run',
    answer: { primeRun: 'ran_stopped', seconds: { value: 2.5, unit: 's' } },
  };
  const noPrime: SeedAnswer = { stepKey: 'prime-run', answer: { primeRun: 'none' } };
  const running = (idle: number, snap: number, held: number): SeedAnswer => ({
    stepKey: 'running-pressure',
    answer: { idle: psi(idle), snap: psi(snap), held: psi(held) },
  });
  const fuel = (answers: SeedAnswer[]): SeedAnswers => ({
    procedure: fuelDelivery,
    answers,
  });
  switch (story) {
    case 'hold-fail':
      return fuel([
        ...basics('fresh'),
        primed,
        { stepKey: 'static-pressure-hold', answer: holdSeries(mid, 2.2) },
        { stepKey: 'engine-runs', answer: { runs: 'yes' } },
        running(mid, mid - 1, mid - 0.5),
        { stepKey: 'filters', answer: { filters: 'ok' } },
      ]);
    case 'clogged-filter':
      return fuel([
        ...basics('fresh'),
        primed,
        { stepKey: 'static-pressure-hold', answer: holdSeries(mid, 0.1) },
        { stepKey: 'engine-runs', answer: { runs: 'yes' } },
        running(mid - 1, spec.pressureMinPsi - 6, spec.pressureMinPsi - 9),
        {
          stepKey: 'flow-volume',
          answer: { volume: { value: 95, unit: 'mL' }, seconds: { value: 15, unit: 's' } },
        },
        { stepKey: 'filters', answer: { filters: 'restricted' } },
      ]);
    case 'no-prime-pump':
      return fuel([
        ...basics('fresh'),
        noPrime,
        { stepKey: 'pump-connector-voltage', answer: { volts: V(rng.round(bat - 0.2, 2)) } },
      ]);
    case 'no-prime-relay':
      return fuel([
        ...basics('fresh'),
        noPrime,
        { stepKey: 'pump-connector-voltage', answer: { volts: V(0) } },
      ]);
    case 'low-voltage': {
      const atPump = rng.round(bat - 2.4, 2);
      return fuel([
        ...basics('fresh'),
        noPrime,
        { stepKey: 'pump-connector-voltage', answer: { volts: V(atPump) } },
        { stepKey: 'supply-voltage-drop', answer: { supplyVolts: V(bat), loadVolts: V(atPump) } },
      ]);
    }
    case 'stale-fuel':
      return fuel([
        ...basics('stale'),
        primed,
        { stepKey: 'static-pressure-hold', answer: holdSeries(mid, 0.2) },
        { stepKey: 'engine-runs', answer: { runs: 'yes' } },
        running(mid, mid - 0.5, mid),
        { stepKey: 'filters', answer: { filters: 'overdue' } },
      ]);
    case 'weak-battery':
      return {
        procedure: batteryCharging,
        answers: [{ stepKey: 'battery-rest', answer: { batteryType: 'flooded', volts: V(12.05) } }],
      };
    case 'low-compression':
      return {
        procedure: compression,
        answers: [
          { stepKey: 'compression-dry', answer: { cylinders: { unit: 'psi', values: [150, 108] } } },
          { stepKey: 'compression-wet', answer: { cylinders: { unit: 'psi', values: [156, 139] } } },
        ],
      };
    case 'service':
      return null;
  }
}

/**
 * One guided check per job, walked through the shared engine with the answers of its story. A
 * job still being diagnosed has only the first half of its answers, as a run paused mid-way.
 */
async function seedCheck(tx: Tx, input: CheckInput) {
  const { story, machine, rng } = input;
  const planned = storyAnswers(story, machine.specs ?? GENERIC_SPECS, rng);
  if (!planned) return;
  const { procedure, answers } = planned;
  const recorded = input.finished ? answers : answers.slice(0, Math.ceil(answers.length / 2));
  const state: RunState = {
    ...startRun(procedure),
    steps: recorded.map((a) => ({
      ...a,
      cautionAcknowledged: procedure.steps[a.stepKey]?.caution ? true : undefined,
    })),
  };
  const view = walkRun(procedure, state, { spec: machineSpec(machine) });
  if (input.finished && !view.finished) throw new Error(`seed story ${story} does not finish its check`);
  const [run] = await tx
    .insert(t.checkRuns)
    .values({
      businessId: input.businessId,
      jobId: input.jobId,
      procedureKey: procedure.key,
      procedureVersion: procedure.version,
      status: view.finished ? 'finished' : 'in_progress',
      verdict: view.outcome?.verdict ?? null,
      findings: view.outcome ? { ...view.outcome, summary: storyDiagnosis[story] } : null,
      startedAt: input.start,
      spec: machineSpec(machine),
      finishedAt: view.finished ? new Date(input.start.getTime() + 40 * 60_000) : null,
      createdBy: input.actorId,
      createdAt: input.start,
    })
    .returning({ id: t.checkRuns.id });
  // One insert for the run's steps and one for its readings: a first start seeds in a blink.
  const at = (seq: number) => new Date(input.start.getTime() + seq * 4 * 60_000);
  if (view.steps.length > 0) {
    await tx.insert(t.checkSteps).values(
      view.steps.map((step) => ({
        businessId: input.businessId,
        checkRunId: run!.id,
        seq: step.seq,
        stepKey: step.stepKey,
        answer: step.answer,
        verdict: step.evaluation?.verdict ?? null,
        reason: step.evaluation?.reason ?? null,
        figures: step.evaluation?.figures ?? null,
        cautionAcknowledgedAt: procedure.steps[step.stepKey]!.caution ? at(step.seq) : null,
        answeredAt: at(step.seq),
      })),
    );
  }
  // Series points are spread back from the step's time; the rest are read at it.
  const readings = view.steps.flatMap((step) =>
    stepReadings(procedure.steps[step.stepKey]!, step.answer).map(({ offsetSec, ...r }) => ({
      ...r,
      businessId: input.businessId,
      jobId: input.jobId,
      checkRunId: run!.id,
      stepKey: step.stepKey,
      takenAt: new Date(at(step.seq).getTime() - offsetSec * 1000),
      createdBy: input.actorId,
      createdAt: at(step.seq),
    })),
  );
  if (readings.length > 0) await tx.insert(t.readings).values(readings);
}

/** The machine's manual figures as the machines table stores them (kPa), or none. */
function machineSpec(machine: DemoMachine): MachineSpec | null {
  const specs = machine.specs;
  if (!specs) return null;
  return {
    fuelPressureMinKpa: psiToKpa(specs.pressureMinPsi),
    fuelPressureMaxKpa: psiToKpa(specs.pressureMaxPsi),
    holdMaxDropKpa: psiToKpa(specs.holdMaxDropPsi),
    holdMinutes: specs.holdMinutes,
    flowMinLph: specs.flowMinLph,
  };
}

async function seedServiceIntervals(
  tx: Tx,
  {
    businessId,
    machineIds,
    customerIds,
    today,
    setUpAt,
  }: {
    businessId: number;
    machineIds: Map<string, number>;
    customerIds: Map<string, number>;
    today: Date;
    setUpAt: Date;
  },
) {
  for (const [i, machine] of demoMachines.entries()) {
    const machineId = machineIds.get(machine.key)!;
    const byHours = machine.meterUnit === 'h';
    // Staggered so the due list has something overdue, something soon and something far off.
    const monthsAgo = [13, 11, 6, 2][i % 4]!;
    const lastDone = new Date(Date.UTC(today.getUTCFullYear(), today.getUTCMonth() - monthsAgo, 10));
    // Generic intervals (common practice, no published source); a machine's manual may say otherwise.
    const rows: {
      item: ServiceItem;
      label: string;
      everyKm: number | null;
      everyHours: number | null;
      everyMonths: number;
    }[] = [
      {
        item: 'fuel_filter',
        label: 'Fuel filter',
        everyKm: byHours ? null : 8_000,
        everyHours: byHours ? 100 : null,
        everyMonths: 12,
      },
      {
        item: 'oil',
        label: 'Engine oil and filter',
        everyKm: byHours ? null : 4_800,
        everyHours: byHours ? 50 : null,
        everyMonths: 12,
      },
    ];
    if (machine.kind === 'side_by_side' || machine.kind === 'atv') {
      rows.push({
        item: 'in_tank_strainer',
        label: 'In-tank fuel strainer',
        everyKm: byHours ? null : 16_000,
        everyHours: byHours ? 200 : null,
        everyMonths: 24,
      });
    }
    const intervals = await tx
      .insert(t.serviceIntervals)
      .values(
        rows.map((row) => ({
          businessId,
          machineId,
          ...row,
          lastDoneOn: isoDate(lastDone),
          lastDoneMeter: Math.max(0, machine.meterReading - (byHours ? monthsAgo * 6 : monthsAgo * 350)),
          source: machine.specs ? ('manual' as const) : ('generic' as const),
          createdAt: setUpAt,
          updatedAt: setUpAt,
        })),
      )
      .returning({ id: t.serviceIntervals.id, everyMonths: t.serviceIntervals.everyMonths });
    if (monthsAgo < 12) continue;
    // Past its months limit: the first such machine has had its reminder mailed, the rest wait.
    const fuelFilter = intervals[0]!;
    const dueOn = isoDate(
      new Date(Date.UTC(lastDone.getUTCFullYear(), lastDone.getUTCMonth() + fuelFilter.everyMonths!, 10)),
    );
    const customer = demoCustomers.find((c) => c.key === machine.customerKey)!;
    const mailed = i === 0;
    const [mail] = mailed
      ? await tx
          .insert(t.outbox)
          .values({
            businessId,
            kind: 'reminder',
            to: customer.email,
            subject: `${machine.make} ${machine.model}: fuel filter due`,
            bodyText: `Your ${machine.make} ${machine.model} is due for a fuel filter change (every ${fuelFilter.everyMonths} months).`,
            status: 'sent',
            attempts: 1,
            idempotencyKey: `reminder-${fuelFilter.id}-${dueOn}`,
            sentAt: at(addDays(today, -5), 8),
            createdAt: at(addDays(today, -5), 8),
          })
          .returning({ id: t.outbox.id })
      : [];
    await tx.insert(t.reminders).values({
      businessId,
      serviceIntervalId: fuelFilter.id,
      machineId,
      customerId: customerIds.get(machine.customerKey)!,
      dueOn,
      status: mailed ? 'sent' : 'pending',
      sentAt: mailed ? at(addDays(today, -5), 8) : null,
      mailId: mail?.id ?? null,
      createdAt: setUpAt,
    });
  }
}

interface InvoiceInput {
  businessId: number;
  jobId: number;
  customerId: number;
  lines: SeedLine[];
  issuedDay: Date;
  payment: PlannedJob['payment'];
  ownerId: number;
  customerEmail: string;
}

async function seedInvoice(tx: Tx, input: InvoiceInput) {
  const totals = invoiceTotals(input.lines, demoBusiness.taxRatePpm, 'per_invoice');
  const [counter] = await tx
    .insert(t.invoiceCounters)
    .values({ businessId: input.businessId, lastNumber: 1 })
    .onConflictDoUpdate({
      target: t.invoiceCounters.businessId,
      set: { lastNumber: sql`${t.invoiceCounters.lastNumber} + 1` },
    })
    .returning({ number: t.invoiceCounters.lastNumber });
  const paidCents =
    input.payment === 'none'
      ? 0
      : input.payment === 'part'
        ? Math.round(totals.totalCents / 2)
        : totals.totalCents;
  const status = paidCents === 0 ? 'issued' : paidCents < totals.totalCents ? 'part_paid' : 'paid';
  const [invoice] = await tx
    .insert(t.invoices)
    .values({
      businessId: input.businessId,
      number: counter!.number,
      jobId: input.jobId,
      customerId: input.customerId,
      status,
      issuedOn: isoDate(input.issuedDay),
      dueOn: isoDate(addDays(input.issuedDay, demoBusiness.invoiceTermsDays)),
      subtotalCents: totals.subtotalCents,
      taxCents: totals.taxCents,
      totalCents: totals.totalCents,
      paidCents,
      balanceCents: totals.totalCents - paidCents,
      taxRatePpm: demoBusiness.taxRatePpm,
      taxRounding: 'per_invoice',
      terms: `Due within ${demoBusiness.invoiceTermsDays} days.`,
      sentAt: at(input.issuedDay, 18),
      createdAt: at(input.issuedDay, 18),
      updatedAt: at(input.issuedDay, 18),
    })
    .returning({ id: t.invoices.id, number: t.invoices.number });
  await tx.insert(t.invoiceLines).values(
    input.lines.map((line, position) => ({
      businessId: input.businessId,
      invoiceId: invoice!.id,
      position,
      kind: line.kind,
      description: line.description,
      quantityMilli: line.quantityMilli,
      unitPriceCents: line.unitPriceCents,
      lineTotalCents: totals.lines[position]!.totalCents,
      taxCents: totals.lines[position]!.taxCents,
    })),
  );
  await tx.insert(t.outbox).values({
    businessId: input.businessId,
    kind: 'invoice',
    to: input.customerEmail,
    // As the mailer words it (services/mail.ts): the number to four digits.
    subject: `Invoice ${String(invoice!.number).padStart(4, '0')} from ${demoBusiness.name}`,
    bodyText: `Your invoice ${invoice!.number} is attached.`,
    attachments: [{ filename: `invoice-${invoice!.number}.pdf`, contentType: 'application/pdf' }],
    status: 'sent',
    attempts: 1,
    idempotencyKey: `invoice-${invoice!.id}-send-1`,
    invoiceId: invoice!.id,
    jobId: input.jobId,
    sentAt: at(input.issuedDay, 18),
    createdAt: at(input.issuedDay, 18),
  });
  if (paidCents > 0) {
    const method = input.payment === 'part' ? 'cash' : input.payment;
    await tx.insert(t.payments).values({
      businessId: input.businessId,
      invoiceId: invoice!.id,
      method: method as 'card' | 'cash' | 'cheque',
      amountCents: paidCents,
      receivedAt: at(addDays(input.issuedDay, 3), 11),
      reference: method === 'cheque' ? `Cheque ${1000 + invoice!.number}` : null,
      recordedBy: input.ownerId,
      createdAt: at(addDays(input.issuedDay, 3), 11),
    });
  }
}
