/**
 * Ten busy years of Ridgeback Mobile Moto for `npm run bench`: the demo seed (server/db/seed.ts)
 * first, then ~1,500 more customers, ~3,000 machines and ~26,000 jobs in the ten years before the
 * demo's six weeks, each with its readings, guided check, lines, invoice, payments and trip.
 *
 * Deterministic: two fixed pseudo-random streams (one plans the years, one fills in the details)
 * and every timestamp derived from `today`, so the same `today` and `scale` give the same rows,
 * ids included (ids are assigned here, after the demo's, and the identity sequences moved past
 * them at the end). Bulk: rows are buffered and written a few thousand per statement (see
 * insertRows), in foreign-key order, one transaction per year of history.
 *
 * Checks are walked through the shared engine (as the demo seed does), so every stored verdict
 * and finding is what the server's re-check derives, and readings come from the answers by the
 * shared `stepReadings` (canonical value and unit, with what was typed kept beside it).
 */
import { TZDate } from '@date-fns/tz';
import { count, eq, sql } from 'drizzle-orm';
import { toSnakeCase } from 'drizzle-orm/casing';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { JobStatus, LineItemKind } from '../../shared/api/jobs';
import type { MachineKind, MeterUnit } from '../../shared/api/machines';
import type { PaymentMethod } from '../../shared/api/invoices';
import type { ServiceItem } from '../../shared/api/reminders';
import { CANONICAL_UNITS, type Quantity } from '../../shared/api/readings';
import { round } from '../../shared/evaluators/types';
import { invoiceTotals, type MoneyLine } from '../../shared/money';
import { batteryCharging } from '../../shared/procedures/battery-charging';
import { compression } from '../../shared/procedures/compression';
import { startRun, walkRun, type RunState } from '../../shared/procedures/engine';
import { fuelDelivery } from '../../shared/procedures/fuel-delivery';
import { stepReadings } from '../../shared/procedures/readings';
import { GENERIC_FUEL_SPEC, type MachineSpec } from '../../shared/procedures/specs';
import type { ProcedureDefinition, StepAnswer } from '../../shared/procedures/types';
import { convert, kpaToPsi, psiToKpa, type UnitId } from '../../shared/units';
import { withCheckDigit } from '../../shared/vin';
import { queryRows, type Db } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { seedDemo } from '../../server/db/seed';
import {
  demoBusiness,
  demoCustomers,
  storiesByKind,
  storyComplaints,
  type JobStory,
} from '../../server/db/seed-data';
import {
  ERRANDS,
  FIRST_NAMES,
  FLEET_CUSTOMERS,
  KIND_WEIGHTS,
  METER_BY_KIND,
  MODELS,
  SURNAMES,
  TOWNS,
  USE_PER_YEAR,
  type ModelLine,
} from './large-scenario';

/** Raised whenever the generator would write different rows: a seed of another version is stale. */
export const LARGE_SEED_VERSION = 1;

/** The fixed "today" of the large seed: the test suite's (tests/helpers/fixtures.ts). */
export const LARGE_TODAY = new Date('2026-11-18T15:00:00Z');

/** Counts at scale 1, chosen to clear the issue's floors with room to spare. */
const FULL = { privateCustomers: 1_485, jobs: 26_400, years: 10 };

/** The demo's plan starts 41 days before today (server/db/seed.ts, planJobs): history ends before it. */
const DEMO_WINDOW_DAYS = 41;
/** The demo's van odometer at its first trip (server/db/seed.ts): the history's last van reaches it. */
const DEMO_VAN_ODOMETER_TENTHS = 482_104;
/** Added to the demo's invoice numbers while the history takes 1…H, then replaced by H. */
const NUMBER_SHIFT = 1_000_000;
/** Rows buffered before they are written, and the most one statement carries. */
const FLUSH_ROWS = 24_000;
const ROWS_PER_STATEMENT = 6_000;

export interface LargeSeedOptions {
  today?: Date;
  /** 1 = the full ten years (≥ 25,000 jobs); 0.01 gives a hundredth, for tests. */
  scale?: number;
  log?: (line: string) => void;
}

export interface LargeSeedResult {
  businessId: number;
  counts: Record<string, number>;
}

// ---------------------------------------------------------------------------------------------
// Pseudo-random numbers and calendar days

/** mulberry32, as the demo seed uses (its copy there is not exported): same seed, same sequence. */
export function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let x = Math.imul(a ^ (a >>> 15), a | 1);
    x ^= x + Math.imul(x ^ (x >>> 7), x | 61);
    return ((x ^ (x >>> 14)) >>> 0) / 4294967296;
  };
  const between = (min: number, max: number) => min + next() * (max - min);
  return {
    next,
    chance: (p: number) => next() < p,
    between,
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)] as T,
    /** An index by weights. */
    weighted: (weights: readonly number[]) => {
      const total = weights.reduce((sum, w) => sum + w, 0);
      let r = next() * total;
      for (const [i, w] of weights.entries()) {
        r -= w;
        if (r < 0) return i;
      }
      return weights.length - 1;
    },
    fixed: (min: number, max: number, places: number) => Number(between(min, max).toFixed(places)),
  };
}
type Rng = ReturnType<typeof prng>;

const DAY_MS = 86_400_000;
const TZ = demoBusiness.timezone;

/** A calendar day as a whole number of days since 1970-01-01 (on the business's wall calendar). */
type Day = number;
const dayOf = (instant: Date): Day => {
  const local = new TZDate(instant, TZ);
  return Math.round(Date.UTC(local.getFullYear(), local.getMonth(), local.getDate()) / DAY_MS);
};
const isoDay = (day: Day) => new Date(day * DAY_MS).toISOString().slice(0, 10);
const weekday = (day: Day) => new Date(day * DAY_MS).getUTCDay();
const yearOf = (day: Day) => new Date(day * DAY_MS).getUTCFullYear();

/** The business's UTC offset per day, taken at noon: working hours never straddle a DST change. */
const offsetCache = new Map<Day, number>();
function offsetMs(day: Day): number {
  let offset = offsetCache.get(day);
  if (offset === undefined) {
    const d = new Date(day * DAY_MS);
    const noon = new TZDate(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), 12, 0, TZ);
    offset = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), 12) - noon.getTime();
    offsetCache.set(day, offset);
  }
  return offset;
}
/** The instant of a wall-clock time (minutes after midnight, may pass 24 h) on a day. */
const at = (day: Day, minutes: number) => new Date(day * DAY_MS + minutes * 60_000 - offsetMs(day));
const plusMinutes = (instant: Date, minutes: number) => new Date(instant.getTime() + minutes * 60_000);

// ---------------------------------------------------------------------------------------------
// The plan: who, which machine, when, what was wrong, how it was paid

interface PlannedCustomer {
  id: number;
  name: string;
  email: string | null;
  phone: string;
  address: string;
  town: (typeof TOWNS)[number];
  since: Day;
  fleet: boolean;
}

interface PlannedMachine {
  id: number;
  customer: PlannedCustomer;
  kind: MachineKind;
  line: ModelLine;
  year: number | null;
  vin: string | null;
  otherId: string | null;
  meterUnit: MeterUnit;
  /** Meter on `from` and its rise per day. */
  meterStart: number;
  perDay: number;
  from: Day;
  until: Day;
  weight: number;
  specs: MachineSpec | null;
  /** psi or bar: what this owner's gauge (and so the mechanic's notes) read in. */
  gaugeUnit: 'psi' | 'bar';
  lastVisit: { day: Day; minutes: number } | null;
  firstVisit: Day | null;
  lastService: Day | null;
}

type Settlement =
  | { kind: 'paid'; payments: { afterDays: number; method: PaymentMethod; share: number }[] }
  | { kind: 'part'; payments: { afterDays: number; method: PaymentMethod; share: number }[] }
  | { kind: 'unpaid' }
  | { kind: 'void' };

interface PlannedJob {
  id: number;
  day: Day;
  /** Minutes after midnight of the booked time. */
  start: number;
  machine: PlannedMachine;
  story: JobStory;
  cancelled: boolean;
  /** Completed with no charge (a warranty re-check): no invoice. */
  noCharge: boolean;
  settlement: Settlement | null;
  issueLag: number;
  invoiceNumber: number | null;
  tripTenths: number;
  tripFee: boolean;
  helper: boolean;
  odometer: { start: number; end: number } | null;
}

interface PlannedErrand {
  day: Day;
  start: number;
  tenths: number;
  errand: (typeof ERRANDS)[number];
  odometer: { start: number; end: number } | null;
}

const FUEL_STORIES = new Set<JobStory>([
  'hold-fail',
  'clogged-filter',
  'no-prime-pump',
  'no-prime-relay',
  'low-voltage',
  'stale-fuel',
]);

function personName(rng: Rng) {
  return `${rng.pick(FIRST_NAMES)} ${rng.pick(SURNAMES)}`;
}

function planCustomers(rng: Rng, scale: number, firstId: number, historyStart: Day, historyEnd: Day) {
  const customers: PlannedCustomer[] = [];
  const fleets = FLEET_CUSTOMERS.slice(0, Math.max(1, Math.round(FLEET_CUSTOMERS.length * scale)));
  const privateCount = Math.max(2, Math.round(FULL.privateCustomers * scale));
  const span = historyEnd - historyStart;
  let id = firstId;
  for (const fleet of fleets) {
    const town = TOWNS.find((candidate) => candidate.name === fleet.town)!;
    const slug = fleet.name.toLowerCase().replace(/[^a-z]+/g, '-');
    customers.push({
      id: id++,
      name: fleet.name,
      email: `office@${slug}.example.test`,
      phone: `555-01${String(rng.int(10, 99))}`,
      address: `${rng.int(2, 990)} ${rng.pick(town.streets)}`,
      town,
      since: historyStart + Math.floor(rng.next() * span * 0.3),
      fleet: true,
    });
  }
  const used = new Set<string>();
  for (let i = 0; i < privateCount; i += 1) {
    let name = personName(rng);
    while (used.has(name)) name = `${personName(rng)}`;
    used.add(name);
    const town = TOWNS[rng.weighted([30, 16, 14, 14, 8, 6, 7, 5])]!;
    // Customers arrive over the years, more of them early (the ones who stayed) and steadily after.
    const since = historyStart + Math.floor(Math.min(rng.next(), rng.next() * 1.3) * span * 0.95);
    const handle = name.toLowerCase().replace(/[^a-z]+/g, '.');
    customers.push({
      id: id++,
      name,
      email: rng.chance(0.88) ? `${handle}.${i}@example.test` : null,
      phone: `555-01${String(rng.int(10, 99))}`,
      address: `${rng.int(2, 4_800)} ${rng.pick(town.streets)}`,
      town,
      since,
      fleet: false,
    });
  }
  return { customers, fleets };
}

const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const VIN_CHARS = '0123456789ABCDEFGHJKLMNPRSTUVWXYZ';
const KINDS = Object.keys(KIND_WEIGHTS) as MachineKind[];

function planMachine(
  rng: Rng,
  id: number,
  customer: PlannedCustomer,
  kind: MachineKind,
  historyEnd: Day,
): PlannedMachine {
  const line = rng.pick(MODELS[kind]);
  const meter = METER_BY_KIND[kind];
  const meterUnit = rng.chance(meter.share) ? meter.first : meter.other;
  const [low, high] = USE_PER_YEAR[meterUnit];
  const perYear = customer.fleet ? high * rng.between(0.7, 1.1) : rng.between(low, high);
  const sinceYear = yearOf(customer.since);
  const year = kind === 'small_engine' && rng.chance(0.3) ? null : rng.int(sinceYear - 9, sinceYear + 2);
  const from = Math.max(customer.since, year === null ? 0 : Math.round(Date.UTC(year, 2, 1) / DAY_MS));
  const until = rng.chance(0.18) ? from + Math.floor(rng.between(0.3, 1) * (historyEnd - from)) : historyEnd;
  const ageYears = year === null ? rng.between(0, 6) : Math.max(0, sinceYear - year);
  const hasVin = kind !== 'small_engine' && kind !== 'watercraft';
  const serial = Array.from({ length: 6 }, () => VIN_CHARS[rng.int(0, 9)]).join('');
  const makeLetter = line.make[0]!;
  const vin =
    hasVin && year !== null
      ? withCheckDigit(
          `7V9${makeLetter}${line.vinCode}0${MODEL_YEAR_CODES[(year - 1980) % 30]}${rng.pick(['C', 'N', 'T'])}${serial}`,
        )
      : null;
  const withSpecs = rng.chance(0.3);
  const bandLow = rng.pick([39, 40, 41, 43, 50, 55]);
  const specs: MachineSpec | null = withSpecs
    ? {
        fuelPressureMinKpa: psiToKpa(bandLow),
        fuelPressureMaxKpa: psiToKpa(bandLow + rng.pick([4, 6, 6, 8])),
        holdMaxDropKpa: psiToKpa(rng.pick([2, 3, 3, 4])),
        holdMinutes: 5,
        flowMinLph: rng.pick([28, 30, 32, 40]),
      }
    : null;
  return {
    id,
    customer,
    kind,
    line,
    year,
    vin,
    otherId: vin ? null : `${line.make.slice(0, 1)}${line.vinCode}-${serial}`,
    meterUnit,
    meterStart: Math.round(ageYears * perYear * rng.between(0.5, 1.1)),
    perDay: perYear / 365,
    from,
    until: Math.max(from + 30, until),
    weight: customer.fleet ? 4 : rng.between(0.5, 1.5),
    specs,
    gaugeUnit: rng.chance(0.15) ? 'bar' : 'psi',
    lastVisit: null,
    firstVisit: null,
    lastService: null,
  };
}

const meterOn = (machine: PlannedMachine, day: Day) =>
  round(machine.meterStart + Math.max(0, day - machine.from) * machine.perDay, 1);

/** Season by month (Jan…Dec): spring and autumn preparation, a quiet deep winter. */
const SEASON = [0.7, 0.75, 0.95, 1.2, 1.3, 1.2, 1.05, 1.05, 1.15, 1.2, 1.05, 0.8];

function storyFor(rng: Rng, kind: MachineKind): JobStory {
  const stories = storiesByKind[kind];
  return rng.pick([...stories, 'service']) as JobStory;
}

function settlementFor(rng: Rng, ageDays: number): Settlement {
  const method = (): PaymentMethod =>
    rng.pick(['card', 'card', 'card', 'cash', 'cash', 'cheque', 'transfer']);
  const r = rng.next();
  if (r < 0.003) return { kind: 'void' };
  // A few old ones never paid; recent weeks keep more open.
  if (r < 0.007 || (ageDays < 75 && r < 0.2)) return { kind: 'unpaid' };
  if (r < 0.09) {
    const first = rng.int(0, 3);
    const payments = [{ afterDays: first, method: method(), share: 0.5 }];
    if (ageDays > 60 || rng.chance(0.3)) {
      payments.push({ afterDays: first + rng.int(10, 40), method: method(), share: 0.5 });
      return { kind: 'paid', payments };
    }
    return { kind: 'part', payments };
  }
  const late = rng.chance(0.12);
  return {
    kind: 'paid',
    payments: [{ afterDays: late ? rng.int(15, 50) : rng.int(0, 12), method: method(), share: 1 }],
  };
}

interface Plan {
  customers: PlannedCustomer[];
  machines: PlannedMachine[];
  jobs: PlannedJob[];
  errands: PlannedErrand[];
  invoiceCount: number;
}

function plan(
  rng: Rng,
  scale: number,
  ids: { customer: number; machine: number; job: number },
  today: Day,
): Plan {
  const historyEnd = today - DEMO_WINDOW_DAYS; // exclusive
  const historyStart = today - Math.round(FULL.years * 365.25);
  const { customers } = planCustomers(rng, scale, ids.customer, historyStart, historyEnd);

  const machines: PlannedMachine[] = [];
  let machineId = ids.machine;
  for (const customer of customers) {
    if (customer.fleet) {
      const fleet = FLEET_CUSTOMERS.find((f) => f.name === customer.name)!;
      const n = Math.max(1, Math.round(fleet.machines * Math.max(scale, 0.05)));
      for (let i = 0; i < n; i += 1) {
        machines.push(planMachine(rng, machineId++, customer, rng.pick(fleet.kinds), historyEnd));
      }
      continue;
    }
    const n = 1 + rng.weighted([40, 33, 18, 9]);
    for (let i = 0; i < n; i += 1) {
      const kind = KINDS[rng.weighted(KINDS.map((k) => KIND_WEIGHTS[k]))]!;
      machines.push(planMachine(rng, machineId++, customer, kind, historyEnd));
    }
  }

  // Working days: Monday to Saturday, closed Christmas Day and New Year's Day.
  const days: Day[] = [];
  for (let day = historyStart; day < historyEnd; day += 1) {
    const iso = isoDay(day);
    if (weekday(day) === 0 || iso.endsWith('-12-25') || iso.endsWith('-01-01')) continue;
    days.push(day);
  }
  const targetJobs = Math.max(20, Math.round(FULL.jobs * scale));
  const shape = days.map(
    (day, i) => SEASON[new Date(day * DAY_MS).getUTCMonth()]! * (0.7 + (0.6 * i) / days.length),
  );
  const shapeTotal = shape.reduce((sum, s) => sum + s, 0);

  // Cumulative weights for picking a machine; one not in its owner's hands that day is redrawn.
  const cumulative: number[] = [];
  let acc = 0;
  for (const machine of machines) cumulative.push((acc += machine.weight));
  const pickMachine = (day: Day) => {
    for (let tries = 0; tries < 60; tries += 1) {
      const r = rng.next() * acc;
      let lo = 0;
      let hi = cumulative.length - 1;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (cumulative[mid]! > r) hi = mid;
        else lo = mid + 1;
      }
      const machine = machines[lo]!;
      if (machine.from <= day && day < machine.until) return machine;
    }
    return null;
  };

  const jobs: PlannedJob[] = [];
  const errands: PlannedErrand[] = [];
  let jobId = ids.job;
  for (const [i, day] of days.entries()) {
    const mean = (targetJobs * shape[i]!) / shapeTotal;
    const n = Math.floor(mean + rng.next());
    let minutes = 7 * 60 + 30 + rng.int(0, 4) * 15;
    for (let slot = 0; slot < n; slot += 1) {
      const machine = pickMachine(day);
      if (!machine) continue;
      const story = storyFor(rng, machine.kind);
      const cancelled = rng.chance(0.035);
      const noCharge = !cancelled && rng.chance(0.012);
      const ageDays = today - day;
      const settlement = cancelled || noCharge ? null : settlementFor(rng, ageDays);
      const [near, far] = machine.customer.town.milesFromBase;
      const job: PlannedJob = {
        id: jobId++,
        day,
        start: minutes,
        machine,
        story,
        cancelled,
        noCharge,
        settlement,
        issueLag: rng.weighted([55, 35, 10]),
        invoiceNumber: null,
        tripTenths: Math.round(rng.between(near, far) * 10),
        tripFee: rng.chance(0.6),
        helper: rng.chance(0.2),
        odometer: null,
      };
      jobs.push(job);
      if (!cancelled) {
        machine.firstVisit ??= day;
        machine.lastVisit = { day, minutes: minutes + 15 };
        if (story === 'service' || story === 'clogged-filter') machine.lastService = day;
      }
      minutes += 55 + rng.int(0, 6) * 10;
    }
    if (rng.chance(0.09)) {
      errands.push({
        day,
        start: Math.min(minutes, 17 * 60),
        tenths: Math.round(rng.between(4, 24) * 10),
        errand: rng.pick(ERRANDS),
        odometer: null,
      });
    }
  }

  // Invoice numbers in the order invoices were issued (gapless, as invoice_counters hands them out).
  const invoiced = jobs.filter((job) => job.settlement !== null);
  invoiced.sort((a, b) => a.day + a.issueLag - (b.day + b.issueLag) || a.id - b.id);
  invoiced.forEach((job, i) => (job.invoiceNumber = i + 1));

  assignOdometers(jobs, errands);
  return { customers, machines, jobs, errands, invoiceCount: invoiced.length };
}

/**
 * Three vans in ten years: a used one at the start, a new one half way, and the one the demo
 * drives, bought used so that its odometer reaches the demo's first trip exactly. Odometers are
 * kept in tenths of a mile so no float noise creeps into a trip's miles.
 */
function assignOdometers(jobs: PlannedJob[], errands: PlannedErrand[]) {
  const trips = [
    ...jobs
      .filter((job) => !job.cancelled)
      .map((job) => ({
        day: job.day,
        start: job.start,
        tenths: job.tripTenths,
        set: (o: { start: number; end: number }) => (job.odometer = o),
      })),
    ...errands.map((errand) => ({
      day: errand.day,
      start: errand.start,
      tenths: errand.tenths,
      set: (o: { start: number; end: number }) => (errand.odometer = o),
    })),
  ].sort((a, b) => a.day - b.day || a.start - b.start);
  // The last van: walk back from the demo's odometer until it has done about 42,000 mi.
  let firstOfLast = trips.length;
  let odometer = DEMO_VAN_ODOMETER_TENTHS;
  while (firstOfLast > 0 && DEMO_VAN_ODOMETER_TENTHS - odometer < 420_000) {
    firstOfLast -= 1;
    odometer -= trips[firstOfLast]!.tenths;
  }
  for (let i = firstOfLast; i < trips.length; i += 1) {
    trips[i]!.set({ start: odometer, end: odometer + trips[i]!.tenths });
    odometer += trips[i]!.tenths;
  }
  const changeover = Math.floor(firstOfLast / 2);
  let van = 315_400; // the first van, bought at 31,540 mi
  for (let i = 0; i < firstOfLast; i += 1) {
    if (i === changeover) van = 150; // the second, new
    trips[i]!.set({ start: van, end: van + trips[i]!.tenths });
    van += trips[i]!.tenths;
  }
}

// ---------------------------------------------------------------------------------------------
// Details: the check a job's story calls for, its readings, its lines

/** Prices move about 3 % a year; the business's current rates are today's. */
const priceFactor = (day: Day, today: Day) => 1 - (0.03 * (today - day)) / 365.25;
const priced = (cents: number, factor: number) => Math.round((cents * factor) / 5) * 5;

interface SeedLine extends MoneyLine {
  kind: LineItemKind;
  description: string;
  partNumber: string | null;
}

const PARTS: Partial<
  Record<JobStory, { description: string; cents: number; code: string; supplies?: boolean }[]>
> = {
  'hold-fail': [{ description: 'Fuel pump assembly', cents: 18_900, code: 'FP210' }],
  'clogged-filter': [
    { description: 'In-line fuel filter', cents: 2_450, code: 'FF044' },
    { description: 'In-tank fuel strainer', cents: 1_875, code: 'ST017' },
  ],
  'no-prime-pump': [{ description: 'Fuel pump', cents: 16_450, code: 'FP118' }],
  'no-prime-relay': [{ description: 'Fuel pump relay', cents: 3_200, code: 'RL009' }],
  'low-voltage': [{ description: 'Ring terminals and heat-shrink', cents: 650, code: 'RT6', supplies: true }],
  'weak-battery': [{ description: 'Battery, AGM 12 V', cents: 11_900, code: 'BT14L' }],
  service: [
    { description: 'Oil and filter kit', cents: 4_800, code: 'SV100' },
    { description: 'Fuel stabiliser', cents: 1_100, code: 'FS1', supplies: true },
  ],
  'stale-fuel': [{ description: 'Fuel system cleaner', cents: 1_400, code: 'FC2', supplies: true }],
};

const LABOUR: Record<JobStory, [number, number, string]> = {
  'hold-fail': [1.25, 2, 'Fuel delivery check and pump replacement'],
  'clogged-filter': [0.75, 1.5, 'Fuel delivery check; filter and strainer replacement'],
  'no-prime-pump': [1, 1.75, 'No-prime diagnosis and pump replacement'],
  'no-prime-relay': [0.5, 1, 'No-prime diagnosis; circuit traced'],
  'low-voltage': [0.75, 1.5, 'Voltage-drop test and ground repair'],
  'weak-battery': [0.4, 0.75, 'Battery and charging test'],
  service: [0.6, 1.5, 'Season service'],
  'low-compression': [0.5, 1, 'Compression test and report'],
  'stale-fuel': [1, 2, 'Fuel system clean after storage'],
};

const DIAGNOSIS: Record<JobStory, string[]> = {
  'hold-fail': [
    'Pressure bled off after the pump stopped: check valve in the pump not holding.',
    'Static pressure fell away over the hold: pump check valve leaking back to the tank.',
  ],
  'clogged-filter': [
    'Running pressure sagged under load and flow was short: filter and strainer restricted.',
    'Lean under load; pressure dipped below the band and the strainer was caked.',
  ],
  'no-prime-pump': ['Full voltage reached the pump connector during prime; the pump itself had failed.'],
  'no-prime-relay': ['Nothing at the pump connector during prime; pump relay found open.'],
  'low-voltage': [
    'Pump fed well under battery voltage; corroded ground eye at the frame.',
    'Voltage drop across the pump feed connector; terminals corroded.',
  ],
  'weak-battery': ['Battery low after rest and would not hold a charge.'],
  service: ['Routine service; nothing out of order.', 'Service done; belts and hoses checked.'],
  'low-compression': ['Compression low and uneven; top end worn.'],
  'stale-fuel': ['Fuel varnished from storage; bowl and jets gummed.'],
};

const WORK: Record<JobStory, string[]> = {
  'hold-fail': ['Fitted a new pump assembly; hold re-tested and held.'],
  'clogged-filter': ['New in-line filter and strainer; running pressure back in the band.'],
  'no-prime-pump': ['Fitted a new pump; prime run and pressure confirmed.'],
  'no-prime-relay': ['Fitted a new pump relay; prime run confirmed.'],
  'low-voltage': ['Cleaned and re-made the ground and feed terminals; drop now under 0.3 V.'],
  'weak-battery': ['Fitted a new battery; charging voltage checked.'],
  service: [
    'Oil and filter, plugs checked, stabiliser added.',
    'Oil, filter and a look over before the season.',
  ],
  'low-compression': ['Quoted a top-end rebuild; customer to decide.'],
  'stale-fuel': ['Drained and cleaned the fuel system; fresh fuel with stabiliser.'],
};

const NOTES = [
  'Customer asked to keep the old parts.',
  'Gate code changed; call ahead next time.',
  'Machine stored in a tight shed: bring the short ramp.',
  'Customer will pay on collection of the invoice by post.',
  'Second machine mentioned for next visit.',
];

function jobLines(
  story: JobStory,
  machine: PlannedMachine,
  factor: number,
  rng: Rng,
  tripMiles: number | null,
) {
  const [low, high, description] = LABOUR[story];
  const labourRate = priced(demoBusiness.labourRateCents, factor);
  const lines: SeedLine[] = [
    {
      kind: 'labour',
      description,
      partNumber: null,
      quantityMilli: Math.round(rng.between(low, high) * 4) * 250,
      unitPriceCents: labourRate,
      taxable: false,
    },
  ];
  for (const part of PARTS[story] ?? []) {
    lines.push({
      kind: part.supplies ? 'supplies' : 'part',
      description: part.description,
      partNumber: part.supplies
        ? `SUP-${part.code}`
        : `${machine.line.make.slice(0, 3).toUpperCase()}-${part.code}`,
      quantityMilli: 1000,
      unitPriceCents: priced(part.cents, factor),
      markupBps: part.supplies ? 0 : demoBusiness.partsMarkupBps,
      taxable: true,
    });
  }
  if (tripMiles !== null) {
    const billable = Math.max(0, Math.ceil(tripMiles) - demoBusiness.tripFeeFreeMiles);
    lines.push({
      kind: 'trip',
      description: `Call-out, ${tripMiles.toFixed(1)} mi`,
      partNumber: null,
      quantityMilli: 1000,
      unitPriceCents: priced(
        demoBusiness.tripFeeBaseCents + billable * demoBusiness.tripFeePerMileCents,
        factor,
      ),
      taxable: false,
    });
  }
  return lines;
}

/** The answers a story gives, step by step, in the units the owner's gauge reads. */
interface Truth {
  story: JobStory;
  /** Pressure band in psi (the machine's manual, else the generic figures). */
  minPsi: number;
  maxPsi: number;
  battery: number;
  gauge: 'psi' | 'bar';
  cylinders: number;
}

function pressure(psi: number, gauge: 'psi' | 'bar') {
  return gauge === 'psi'
    ? { value: round(psi, 1), unit: 'psi' as const }
    : { value: round(convert(psi, 'psi', 'bar'), 2), unit: 'bar' as const };
}
const volts = (value: number) => ({ value: round(value, 2), unit: 'V' as const });

const SYMPTOMS: Partial<Record<JobStory, string[]>> = {
  'hold-fail': ['long_cranking'],
  'clogged-filter': ['cuts_out_under_load', 'stumbles_on_acceleration'],
  'no-prime-pump': ['no_start'],
  'no-prime-relay': ['no_start'],
  'low-voltage': ['stumbles_on_acceleration'],
  'stale-fuel': ['stumbles_on_acceleration'],
};

function answerFor(stepKey: string, truth: Truth, rng: Rng): StepAnswer {
  const mid = (truth.minPsi + truth.maxPsi) / 2;
  const { story, gauge } = truth;
  switch (stepKey) {
    case 'symptoms':
      return { symptoms: SYMPTOMS[story] ?? [] };
    case 'basics-battery':
      return { batteryType: 'flooded', volts: volts(truth.battery) };
    case 'basics-fuel':
      return { fuel: story === 'stale-fuel' ? 'stale' : rng.chance(0.05) ? 'unknown' : 'fresh' };
    case 'basics-air-filter':
      return { airFilter: rng.chance(0.08) ? 'dirty' : 'clean' };
    case 'basics-fault-codes':
      return { faultCodes: rng.chance(0.05) ? 'stored' : 'none' };
    case 'basics-engine':
      return { engine: rng.chance(0.6) ? 'confirmed' : 'assumed' };
    case 'prime-run':
      return ['no-prime-pump', 'no-prime-relay', 'low-voltage'].includes(story)
        ? { primeRun: 'none' }
        : { primeRun: 'ran_stopped', seconds: { value: rng.fixed(2, 3.2, 1), unit: 's' } };
    case 'pump-connector-voltage': {
      const atPump =
        story === 'no-prime-relay'
          ? 0
          : story === 'low-voltage'
            ? truth.battery - rng.between(2, 3.2)
            : truth.battery - rng.between(0.05, 0.35);
      return { volts: volts(atPump) };
    }
    case 'supply-voltage-drop':
      return { supplyVolts: volts(truth.battery), loadVolts: volts(truth.battery - rng.between(2, 3.2)) };
    case 'static-pressure-hold': {
      const leak = story === 'hold-fail' ? rng.between(1.4, 3) : rng.between(0, 0.25);
      const peak = mid + rng.between(-1, 1);
      return {
        points: {
          unit: gauge,
          points: [0, 30, 60, 120, 180, 240, 300].map((sec) => {
            const settle = sec >= 30 ? 1 : 0; // the normal small drop right after the pump stops
            const fall = sec > 30 ? ((sec - 30) / 60) * leak : 0;
            return { sec, value: pressure(peak - settle - fall, gauge).value };
          }),
        },
      };
    }
    case 'engine-runs':
      return { runs: story === 'clogged-filter' && rng.chance(0.15) ? 'no' : 'yes' };
    case 'running-pressure':
      return story === 'clogged-filter'
        ? {
            idle: pressure(mid - rng.between(0, 1.5), gauge),
            snap: pressure(truth.minPsi - rng.between(4, 8), gauge),
            held: pressure(truth.minPsi - rng.between(6, 10), gauge),
          }
        : {
            idle: pressure(mid + rng.between(-0.8, 0.8), gauge),
            snap: pressure(mid - rng.between(0.3, 1.2), gauge),
            held: pressure(mid + rng.between(-0.6, 0.6), gauge),
          };
    case 'flow-volume':
      return story === 'clogged-filter'
        ? { volume: { value: rng.int(70, 115), unit: 'mL' }, seconds: { value: 15, unit: 's' } }
        : { volume: { value: rng.int(150, 230), unit: 'mL' }, seconds: { value: 15, unit: 's' } };
    case 'filters':
      return {
        filters:
          story === 'clogged-filter'
            ? 'restricted'
            : story === 'stale-fuel'
              ? 'overdue'
              : rng.pick(['ok', 'ok', 'ok', 'unknown']),
      };
    case 'battery-rest':
      return { batteryType: rng.chance(0.7) ? 'flooded' : 'agm', volts: volts(truth.battery) };
    case 'cranking-voltage':
      return { volts: volts(story === 'weak-battery' ? rng.between(8.8, 9.8) : rng.between(9.9, 11)) };
    case 'starter-circuit-drop': {
      const supply = rng.between(9.6, 10.4);
      return { supplyVolts: volts(supply), loadVolts: volts(supply - rng.between(0.2, 0.9)) };
    }
    case 'charging-voltage':
      return { volts: volts(rng.chance(0.15) ? rng.between(12.7, 13.1) : rng.between(13.6, 14.6)) };
    case 'compression-dry':
    case 'compression-wet': {
      const wet = stepKey === 'compression-wet';
      const values = Array.from({ length: truth.cylinders }, (_, i) => {
        const healthy = rng.between(148, 175);
        const low = i === truth.cylinders - 1 && story === 'low-compression';
        const dry = low ? rng.between(92, 125) : healthy;
        return Math.round(wet ? dry + (low ? rng.between(5, 40) : rng.between(2, 8)) : dry);
      });
      return { cylinders: { unit: 'psi', values } };
    }
  }
  throw new Error(`the large seed has no answer for step ${stepKey}`);
}

function procedureFor(story: JobStory): ProcedureDefinition | null {
  if (story === 'service') return null;
  if (story === 'weak-battery') return batteryCharging;
  if (story === 'low-compression') return compression;
  return fuelDelivery;
}

/** Walks the story's answers through the shared engine until the check finishes. */
function walkCheck(procedure: ProcedureDefinition, truth: Truth, spec: MachineSpec | null, rng: Rng) {
  const state: RunState = startRun(procedure);
  let view = walkRun(procedure, state, { spec });
  for (let guard = 0; view.current && guard < 30; guard += 1) {
    const step = view.current;
    state.steps.push({
      stepKey: step.key,
      answer: answerFor(step.key, truth, rng),
      ...(step.caution ? { cautionAcknowledged: true } : {}),
    });
    view = walkRun(procedure, state, { spec });
  }
  if (!view.finished) throw new Error(`the ${truth.story} check did not finish`);
  return view;
}

// ---------------------------------------------------------------------------------------------
// Writing: buffered multi-row inserts in foreign-key order

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** A row as inserted, with the id this seed assigns (identity columns are left out of $inferInsert). */
type Row<T extends PgTable> = T['$inferInsert'] & { id: number };

const TABLES = {
  customers: t.customers,
  machines: t.machines,
  serviceIntervals: t.serviceIntervals,
  jobs: t.jobs,
  jobEvents: t.jobEvents,
  checkRuns: t.checkRuns,
  checkSteps: t.checkSteps,
  readings: t.readings,
  lineItems: t.lineItems,
  estimates: t.estimates,
  invoices: t.invoices,
  invoiceLines: t.invoiceLines,
  payments: t.payments,
  outbox: t.outbox,
  trips: t.trips,
  reminders: t.reminders,
} as const;
type TableKey = keyof typeof TABLES;

/**
 * One statement for many rows: the rows travel as one JSON parameter that PostgreSQL turns into
 * the table's own row type (json_populate_recordset), about twice as fast here as a VALUES list
 * of bound parameters, most of whose cost is building the SQL. Columns no row names take their
 * defaults; the ids are this seed's (Sink.id), so the identity columns take them as given.
 */
async function insertRows(tx: Tx, table: PgTable, rows: Record<string, unknown>[]) {
  const keys = [...new Set(rows.flatMap((row) => Object.keys(row)))];
  const columns = keys.map(toSnakeCase);
  const json = JSON.stringify(
    rows.map((row) => Object.fromEntries(keys.map((key, i) => [columns[i], row[key] ?? null]))),
  );
  const list = sql.raw(columns.map((c) => `"${c}"`).join(', '));
  const name = sql.identifier(tableName(table));
  await tx.execute(
    sql`insert into ${name} (${list}) overriding system value
        select ${list} from json_populate_recordset(null::${name}, ${json}::json)`,
  );
}

class Sink {
  private rows = new Map<TableKey, unknown[]>();
  private buffered = 0;
  readonly written: Partial<Record<TableKey, number>> = {};
  readonly next: Record<TableKey, number>;
  tx: Tx | null = null;

  constructor(firstIds: Record<TableKey, number>) {
    this.next = { ...firstIds };
  }

  /** The id the next row of `table` gets (ids are assigned here, in insert order). */
  id(table: TableKey): number {
    return this.next[table]++;
  }

  async add<K extends TableKey>(table: K, row: Row<(typeof TABLES)[K]>) {
    let list = this.rows.get(table);
    if (!list) this.rows.set(table, (list = []));
    list.push(row);
    this.buffered += 1;
    if (this.buffered >= FLUSH_ROWS) await this.flush();
  }

  /** Time spent writing, for the seed's progress lines. */
  flushMs = 0;

  async flush() {
    const began = performance.now();
    const tx = this.tx;
    if (!tx) throw new Error('no open transaction');
    for (const key of Object.keys(TABLES) as TableKey[]) {
      const list = this.rows.get(key) as Record<string, unknown>[] | undefined;
      if (!list || list.length === 0) continue;
      for (let i = 0; i < list.length; i += ROWS_PER_STATEMENT) {
        await insertRows(tx, TABLES[key], list.slice(i, i + ROWS_PER_STATEMENT));
      }
      this.written[key] = (this.written[key] ?? 0) + list.length;
      list.length = 0;
    }
    this.buffered = 0;
    this.flushMs += performance.now() - began;
  }
}

const TRAIL: JobStatus[] = [
  'booked',
  'on_site',
  'diagnosing',
  'awaiting_approval',
  'repairing',
  'complete',
  'invoiced',
  'paid',
];

export async function seedLarge(db: Db, options: LargeSeedOptions = {}): Promise<LargeSeedResult> {
  const today = options.today ?? LARGE_TODAY;
  const scale = options.scale ?? 1;
  const log = options.log ?? (() => {});
  const todayDay = dayOf(today);

  const { businessId } = await seedDemo(db, { today });
  const [existing] = await db
    .select({ n: count() })
    .from(t.customers)
    .where(eq(t.customers.businessId, businessId));
  if ((existing?.n ?? 0) > demoCustomers.length) {
    throw new Error(
      'this database already holds more than the demo: seed the large history into an empty one',
    );
  }
  const users = await db.select().from(t.users).where(eq(t.users.businessId, businessId));
  const ownerId = users.find((u) => u.role === 'owner')!.id;
  const helperId = users.find((u) => u.role === 'helper')!.id;

  const firstIds = {} as Record<TableKey, number>;
  for (const [key, table] of Object.entries(TABLES) as [TableKey, PgTable][]) {
    const [row] = await queryRows<{ max: number | null }>(db, sql`select max(id)::int as max from ${table}`);
    firstIds[key] = (row?.max ?? 0) + 1;
  }
  const sink = new Sink(firstIds);

  const planRng = prng(0x1a26_e5ed);
  const rng = prng(0xde7a_2026);
  const planned = plan(
    planRng,
    scale,
    { customer: firstIds.customers, machine: firstIds.machines, job: firstIds.jobs },
    todayDay,
  );
  sink.next.customers += planned.customers.length;
  sink.next.machines += planned.machines.length;
  sink.next.jobs += planned.jobs.length;
  log(
    `planned ${planned.customers.length} customers, ${planned.machines.length} machines, ${planned.jobs.length} jobs, ${planned.invoiceCount} invoices`,
  );

  // The demo's invoices keep their order but move after the history's: shifted out of the way now.
  await db.execute(
    sql`update ${t.invoices} set number = number + ${NUMBER_SHIFT} where business_id = ${businessId}`,
  );

  const historyStart = Math.min(...planned.customers.map((c) => c.since));
  await db.transaction(async (tx) => {
    sink.tx = tx;
    for (const customer of planned.customers) {
      const createdAt = at(customer.since, 9 * 60);
      await sink.add('customers', {
        id: customer.id,
        businessId,
        name: customer.name,
        email: customer.email,
        phone: customer.phone,
        addressLines: [customer.address],
        town: customer.town.name,
        notes: customer.fleet ? 'Fleet account: invoices to the office address.' : null,
        createdAt,
        updatedAt: createdAt,
      });
    }
    for (const machine of planned.machines) {
      const createdAt = at(Math.max(machine.from, machine.customer.since), 9 * 60 + 5);
      const lastVisit = machine.lastVisit;
      await sink.add('machines', {
        id: machine.id,
        businessId,
        customerId: machine.customer.id,
        kind: machine.kind,
        year: machine.year,
        make: machine.line.make,
        model: machine.line.model,
        vin: machine.vin,
        otherId: machine.otherId,
        meterUnit: machine.meterUnit,
        meterReading: lastVisit ? meterOn(machine, lastVisit.day) : machine.meterStart,
        meterReadAt: lastVisit ? at(lastVisit.day, lastVisit.minutes) : createdAt,
        ...(machine.specs ?? {}),
        specsNote: machine.specs ? 'Entered from the service manual.' : null,
        archivedAt: machine.until < todayDay - DEMO_WINDOW_DAYS ? at(machine.until, 12 * 60) : null,
        createdAt,
        updatedAt: lastVisit ? at(lastVisit.day, lastVisit.minutes) : createdAt,
      });
      await addIntervals(sink, machine, businessId, todayDay, createdAt);
    }
    await sink.flush();
  });
  log('customers, machines and service intervals written');

  const years = [...new Set(planned.jobs.map((job) => yearOf(job.day)))].sort();
  let errandIndex = 0;
  let jobIndex = 0;
  const lastTripDay = { day: 0 };
  for (const year of years) {
    await db.transaction(async (tx) => {
      sink.tx = tx;
      while (jobIndex < planned.jobs.length && yearOf(planned.jobs[jobIndex]!.day) === year) {
        const job = planned.jobs[jobIndex++]!;
        while (errandIndex < planned.errands.length && planned.errands[errandIndex]!.day <= job.day) {
          await addErrand(sink, planned.errands[errandIndex++]!, businessId, ownerId);
        }
        await addJob(sink, job, { businessId, ownerId, helperId, today: todayDay, rng, lastTripDay });
      }
      if (jobIndex >= planned.jobs.length) {
        while (errandIndex < planned.errands.length) {
          await addErrand(sink, planned.errands[errandIndex++]!, businessId, ownerId);
        }
      }
      await sink.flush();
    });
    log(
      `${year}: written (${sink.written.jobs ?? 0} jobs, ${sink.written.readings ?? 0} readings so far; ${Math.round(sink.flushMs / 1000)} s of it writing)`,
    );
  }

  await db.transaction(async (tx) => {
    // The demo's invoices follow the history's, numbers still gapless; their mails say so.
    await tx.execute(
      sql`update ${t.invoices} set number = number - ${NUMBER_SHIFT} + ${planned.invoiceCount}
          where business_id = ${businessId} and number > ${NUMBER_SHIFT}`,
    );
    await tx.execute(
      sql`update ${t.outbox} o
          set subject = 'Invoice ' || i.number || ' from ' || ${demoBusiness.name},
              body_text = 'Your invoice ' || i.number || ' is attached.',
              attachments = jsonb_build_array(jsonb_build_object(
                'filename', 'invoice-' || i.number || '.pdf', 'contentType', 'application/pdf'))
          from ${t.invoices} i
          where o.invoice_id = i.id and o.kind = 'invoice' and i.id < ${firstIds.invoices}`,
    );
    await tx.execute(
      sql`update ${t.invoiceCounters} set last_number = (select max(number) from ${t.invoices} where business_id = ${businessId})
          where business_id = ${businessId}`,
    );
    // A ten-year business: set up when its history starts.
    const setUp = at(historyStart, 8 * 60);
    await tx
      .update(t.businesses)
      .set({ createdAt: setUp, updatedAt: setUp })
      .where(eq(t.businesses.id, businessId));
    await tx
      .update(t.users)
      .set({ createdAt: setUp, updatedAt: setUp })
      .where(eq(t.users.businessId, businessId));
    for (const table of Object.values(TABLES)) {
      await tx.execute(
        sql`select setval(pg_get_serial_sequence(${`public.${tableName(table)}`}, 'id'), (select max(id) from ${table}))`,
      );
    }
  });
  return { businessId, counts: await tableCounts(db) };
}

function tableName(table: PgTable): string {
  return (table as unknown as Record<symbol, string>)[Symbol.for('drizzle:Name')]!;
}

async function addIntervals(
  sink: Sink,
  machine: PlannedMachine,
  businessId: number,
  today: Day,
  createdAt: Date,
) {
  const byHours = machine.meterUnit === 'h';
  const lastDone =
    machine.lastService ?? machine.firstVisit ?? Math.max(machine.from, machine.customer.since);
  // Generic intervals (common practice, no published source), as the demo seed sets them.
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
  for (const row of rows) {
    const id = sink.id('serviceIntervals');
    await sink.add('serviceIntervals', {
      id,
      businessId,
      machineId: machine.id,
      ...row,
      lastDoneOn: isoDay(lastDone),
      lastDoneMeter: meterOn(machine, lastDone),
      source: machine.specs ? 'manual' : 'generic',
      createdAt,
      updatedAt: createdAt,
    });
    // A reminder for a fuel filter past its months, on a machine still in use: mailed when recent.
    if (row.item !== 'fuel_filter' || machine.until < today - DEMO_WINDOW_DAYS) continue;
    const due = new Date(lastDone * DAY_MS);
    due.setUTCMonth(due.getUTCMonth() + row.everyMonths);
    const dueDay = Math.round(due.getTime() / DAY_MS);
    if (dueDay >= today - DEMO_WINDOW_DAYS) continue;
    const mailed = machine.customer.email !== null && dueDay >= today - 400;
    const mailId = mailed ? sink.id('outbox') : null;
    const sentAt = at(dueDay, 8 * 60);
    if (mailId !== null) {
      await sink.add('outbox', {
        id: mailId,
        businessId,
        kind: 'reminder',
        to: machine.customer.email!,
        subject: `${machine.line.make} ${machine.line.model}: fuel filter due`,
        bodyText: `Your ${machine.line.make} ${machine.line.model} is due for a fuel filter change (every ${row.everyMonths} months).`,
        attachments: [],
        status: 'sent',
        attempts: 1,
        idempotencyKey: `reminder-${id}-${isoDay(dueDay)}`,
        sentAt,
        createdAt: sentAt,
      });
    }
    await sink.add('reminders', {
      id: sink.id('reminders'),
      businessId,
      serviceIntervalId: id,
      machineId: machine.id,
      customerId: machine.customer.id,
      dueOn: isoDay(dueDay),
      status: mailed ? 'sent' : 'pending',
      sentAt: mailed ? sentAt : null,
      mailId,
      createdAt: at(dueDay - 30, 8 * 60),
    });
  }
}

async function addErrand(sink: Sink, errand: PlannedErrand, businessId: number, ownerId: number) {
  const startedAt = at(errand.day, errand.start);
  const endedAt = plusMinutes(startedAt, 20 + errand.tenths / 4);
  await sink.add('trips', {
    id: sink.id('trips'),
    businessId,
    jobId: null,
    tripDate: isoDay(errand.day),
    startOdometer: errand.odometer!.start / 10,
    endOdometer: errand.odometer!.end / 10,
    odometerUnit: 'mi',
    origin: 'previous job',
    destination: errand.errand.destination,
    purpose: errand.errand.purpose,
    startedAt,
    endedAt,
    createdBy: ownerId,
    createdAt: endedAt,
  });
}

interface JobContext {
  /** The day of the last trip written: the day's first trip sets out from home base. */
  lastTripDay: { day: Day };
  businessId: number;
  ownerId: number;
  helperId: number;
  today: Day;
  rng: Rng;
}

async function addJob(sink: Sink, job: PlannedJob, ctx: JobContext) {
  const { businessId, ownerId, helperId, rng } = ctx;
  const { machine, story, day } = job;
  const customer = machine.customer;
  const factor = priceFactor(day, ctx.today);
  const actorId = job.helper ? helperId : ownerId;
  const scheduledAt = at(day, job.start);
  const bookedAt = at(day - rng.int(1, 12), 9 * 60 + rng.int(0, 8 * 60));
  const arrivedAt = plusMinutes(scheduledAt, rng.int(-5, 20));
  const status: JobStatus = job.cancelled
    ? 'cancelled'
    : job.settlement === null || job.settlement.kind === 'void'
      ? 'complete'
      : job.settlement.kind === 'paid'
        ? 'paid'
        : 'invoiced';
  const done = !job.cancelled;
  const procedure = done ? procedureFor(story) : null;
  const truth: Truth = {
    story,
    minPsi: kpaToPsi(machine.specs?.fuelPressureMinKpa ?? GENERIC_FUEL_SPEC.fuelPressureMinKpa),
    maxPsi: kpaToPsi(machine.specs?.fuelPressureMaxKpa ?? GENERIC_FUEL_SPEC.fuelPressureMaxKpa),
    battery: story === 'weak-battery' ? rng.between(11.7, 12.35) : rng.between(12.5, 12.8),
    gauge: machine.gaugeUnit,
    cylinders: machine.line.cylinders,
  };
  const checkStart = plusMinutes(arrivedAt, 10);
  const view = procedure ? walkCheck(procedure, truth, machine.specs, rng) : null;
  const checkMinutes = view ? view.steps.length * 4 + 6 : 0;
  const repairedAt = plusMinutes(checkStart, checkMinutes + 15);
  const completedAt = plusMinutes(repairedAt, rng.int(25, 80));
  const location =
    customer.fleet || rng.chance(0.7)
      ? `${customer.address}, ${customer.town.name}`
      : `${rng.pick(customer.town.places)}, ${customer.town.name}`;
  const complaint = rng.chance(0.8)
    ? storyComplaints[story]
    : `${storyComplaints[story]} ${rng.pick(['Worse when hot.', 'Started last week.', 'Came on gradually.', 'Needed for the weekend.'])}`;

  await sink.add('jobs', {
    id: job.id,
    businessId,
    customerId: customer.id,
    machineId: machine.id,
    status,
    complaint,
    location,
    scheduledAt,
    arrivedAt: done ? arrivedAt : null,
    completedAt: done ? completedAt : null,
    cancelledAt: job.cancelled ? at(day - 1, 17 * 60) : null,
    meterReading: done ? meterOn(machine, day) : null,
    diagnosis: done ? rng.pick(DIAGNOSIS[story]) : null,
    workDone: done ? rng.pick(WORK[story]) : null,
    createdBy: ownerId,
    createdAt: bookedAt,
    updatedAt: done ? completedAt : at(day - 1, 17 * 60),
  });

  // The check and its readings.
  if (view && procedure) {
    const runId = sink.id('checkRuns');
    const stepAt = (seq: number) => plusMinutes(checkStart, seq * 4);
    await sink.add('checkRuns', {
      id: runId,
      businessId,
      jobId: job.id,
      procedureKey: procedure.key,
      procedureVersion: procedure.version,
      status: 'finished',
      verdict: view.outcome?.verdict ?? null,
      findings: view.outcome ? { ...view.outcome, summary: rng.pick(DIAGNOSIS[story]) } : null,
      spec: machine.specs,
      startedAt: checkStart,
      finishedAt: plusMinutes(checkStart, checkMinutes),
      createdBy: actorId,
      createdAt: checkStart,
    });
    for (const step of view.steps) {
      const definition = procedure.steps[step.stepKey]!;
      await sink.add('checkSteps', {
        id: sink.id('checkSteps'),
        businessId,
        checkRunId: runId,
        seq: step.seq,
        stepKey: step.stepKey,
        answer: step.answer,
        verdict: step.evaluation?.verdict ?? null,
        reason: step.evaluation?.reason ?? null,
        figures: step.evaluation?.figures ?? null,
        cautionAcknowledgedAt: definition.caution ? stepAt(step.seq) : null,
        answeredAt: stepAt(step.seq),
      });
      for (const { offsetSec, ...reading } of stepReadings(definition, step.answer)) {
        await sink.add('readings', {
          id: sink.id('readings'),
          businessId,
          jobId: job.id,
          checkRunId: runId,
          stepKey: step.stepKey,
          ...reading,
          takenAt: new Date(stepAt(step.seq).getTime() - offsetSec * 1000),
          createdBy: actorId,
          createdAt: stepAt(step.seq),
        });
      }
    }
  }
  if (done) {
    for (const reading of extraReadings(story, truth, rng)) {
      const takenAt = plusMinutes(story === 'service' ? checkStart : completedAt, reading.offset);
      await sink.add('readings', {
        id: sink.id('readings'),
        businessId,
        jobId: job.id,
        checkRunId: null,
        stepKey: reading.stepKey,
        quantity: reading.quantity,
        value: convert(reading.entered, reading.unit, reading.canonical),
        unit: reading.canonical,
        enteredValue: reading.entered,
        enteredUnit: reading.unit,
        note: reading.note,
        takenAt,
        createdBy: actorId,
        createdAt: takenAt,
      });
    }
  }

  // Status moves, and now and then a note.
  const trail = job.cancelled
    ? (['booked', 'cancelled'] as JobStatus[])
    : TRAIL.slice(0, TRAIL.indexOf(status) + 1);
  const tripMiles = job.tripTenths / 10;
  const lines = done ? jobLines(story, machine, factor, rng, job.tripFee ? tripMiles : null) : [];
  const totals = invoiceTotals(lines, demoBusiness.taxRatePpm, 'per_invoice');
  const payments = paymentsOf(job, totals.totalCents);
  const eventAt: Partial<Record<JobStatus, Date>> = {
    booked: bookedAt,
    cancelled: at(day - 1, 17 * 60),
    on_site: arrivedAt,
    diagnosing: checkStart,
    awaiting_approval: plusMinutes(checkStart, checkMinutes + 2),
    repairing: plusMinutes(checkStart, checkMinutes + 12),
    complete: completedAt,
    invoiced: at(day + job.issueLag, 18 * 60),
    paid: payments.at(-1)?.receivedAt ?? completedAt,
  };
  for (const [i, to] of trail.entries()) {
    await sink.add('jobEvents', {
      id: sink.id('jobEvents'),
      businessId,
      jobId: job.id,
      fromStatus: i === 0 ? null : trail[i - 1]!,
      toStatus: to,
      actorId: to === 'booked' || to === 'invoiced' || to === 'paid' ? ownerId : actorId,
      at: eventAt[to]!,
    });
  }
  if (rng.chance(0.1)) {
    await sink.add('jobEvents', {
      id: sink.id('jobEvents'),
      businessId,
      jobId: job.id,
      note: rng.pick(NOTES),
      actorId: ownerId,
      at: plusMinutes(bookedAt, 30),
    });
  }
  if (job.cancelled) return;

  // Trip to the job.
  const tripStart = plusMinutes(scheduledAt, -(15 + Math.round(tripMiles * 1.4)));
  await sink.add('trips', {
    id: sink.id('trips'),
    businessId,
    jobId: job.id,
    tripDate: isoDay(day),
    startOdometer: job.odometer!.start / 10,
    endOdometer: job.odometer!.end / 10,
    odometerUnit: 'mi',
    origin: ctx.lastTripDay.day === day ? 'previous job' : 'home base, Cinder Valley',
    destination: location,
    purpose: `${machine.line.make} ${machine.line.model}: ${LABOUR[story][2].toLowerCase()}`,
    startedAt: tripStart,
    endedAt: completedAt,
    createdBy: actorId,
    createdAt: completedAt,
  });
  ctx.lastTripDay.day = day;

  // Lines, estimate, invoice, payments, the invoice mail.
  const linesAt = plusMinutes(checkStart, checkMinutes + 1);
  for (const [position, line] of lines.entries()) {
    await sink.add('lineItems', {
      id: sink.id('lineItems'),
      businessId,
      jobId: job.id,
      kind: line.kind,
      description: line.description,
      partNumber: line.partNumber,
      quantityMilli: line.quantityMilli,
      unitPriceCents: line.unitPriceCents,
      markupBps: line.markupBps ?? 0,
      taxable: line.taxable,
      position,
      createdAt: linesAt,
      updatedAt: linesAt,
    });
  }
  if (totals.totalCents >= 15_000) {
    await sink.add('estimates', {
      id: sink.id('estimates'),
      businessId,
      jobId: job.id,
      status: 'approved',
      totalCents: totals.totalCents,
      lines: lines.map(({ kind, description, quantityMilli, unitPriceCents }) => ({
        kind,
        description,
        quantityMilli,
        unitPriceCents,
      })),
      sentAt: eventAt.awaiting_approval!,
      decidedAt: eventAt.repairing!,
      decidedBy: ownerId,
      createdAt: eventAt.awaiting_approval!,
    });
  }
  if (job.settlement === null || job.invoiceNumber === null) return;

  const issuedDay = day + job.issueLag;
  const issuedAt = at(issuedDay, 18 * 60);
  const invoiceId = sink.id('invoices');
  const voided = job.settlement.kind === 'void';
  const paidCents = payments.reduce((sum, p) => sum + p.amountCents, 0);
  const invoiceStatus = voided
    ? 'void'
    : paidCents === 0
      ? 'issued'
      : paidCents < totals.totalCents
        ? 'part_paid'
        : 'paid';
  const lastPaid = payments.at(-1)?.receivedAt;
  await sink.add('invoices', {
    id: invoiceId,
    businessId,
    number: job.invoiceNumber,
    jobId: job.id,
    customerId: customer.id,
    status: invoiceStatus,
    issuedOn: isoDay(issuedDay),
    dueOn: isoDay(issuedDay + demoBusiness.invoiceTermsDays),
    subtotalCents: totals.subtotalCents,
    taxCents: totals.taxCents,
    totalCents: totals.totalCents,
    paidCents,
    balanceCents: totals.totalCents - paidCents,
    taxRatePpm: demoBusiness.taxRatePpm,
    taxRounding: 'per_invoice',
    terms: `Due within ${demoBusiness.invoiceTermsDays} days.`,
    sentAt: customer.email ? issuedAt : null,
    voidedAt: voided ? at(issuedDay + 2, 10 * 60) : null,
    createdAt: issuedAt,
    updatedAt: voided ? at(issuedDay + 2, 10 * 60) : (lastPaid ?? issuedAt),
  });
  for (const [position, line] of lines.entries()) {
    await sink.add('invoiceLines', {
      id: sink.id('invoiceLines'),
      businessId,
      invoiceId,
      position,
      kind: line.kind,
      description: line.description,
      quantityMilli: line.quantityMilli,
      unitPriceCents: line.unitPriceCents,
      lineTotalCents: totals.lines[position]!.totalCents,
      taxCents: totals.lines[position]!.taxCents,
    });
  }
  for (const payment of payments) {
    await sink.add('payments', {
      id: sink.id('payments'),
      businessId,
      invoiceId,
      method: payment.method,
      amountCents: payment.amountCents,
      receivedAt: payment.receivedAt,
      reference:
        payment.method === 'cheque'
          ? `Cheque ${rng.int(1000, 9999)}`
          : payment.method === 'transfer'
            ? `Transfer ref ${job.invoiceNumber}`
            : null,
      recordedBy: ownerId,
      createdAt: payment.receivedAt,
    });
  }
  if (customer.email) {
    await sink.add('outbox', {
      id: sink.id('outbox'),
      businessId,
      kind: 'invoice',
      to: customer.email,
      // As the mailer words it (services/mail.ts): the number to four digits.
      subject: `Invoice ${String(job.invoiceNumber).padStart(4, '0')} from ${demoBusiness.name}`,
      bodyText: `Your invoice ${job.invoiceNumber} is attached.`,
      attachments: [{ filename: `invoice-${job.invoiceNumber}.pdf`, contentType: 'application/pdf' }],
      status: 'sent',
      attempts: 1,
      idempotencyKey: `invoice-${invoiceId}-send-1`,
      invoiceId,
      jobId: job.id,
      sentAt: issuedAt,
      createdAt: issuedAt,
    });
  }
}

/** The payments of a settled invoice, the last one (of a paid invoice) taking what is left. */
function paymentsOf(job: PlannedJob, totalCents: number) {
  const settlement = job.settlement;
  if (!settlement || settlement.kind === 'void' || settlement.kind === 'unpaid') return [];
  let remaining = totalCents;
  return settlement.payments.map((p, i) => {
    const last = i === settlement.payments.length - 1 && settlement.kind === 'paid';
    const amountCents = last ? remaining : Math.min(remaining, Math.round(totalCents * p.share));
    remaining -= amountCents;
    return {
      method: p.method,
      amountCents,
      receivedAt: at(job.day + job.issueLag + p.afterDays, 10 * 60 + (job.id % 7) * 60),
    };
  });
}

interface ExtraReading {
  quantity: Quantity;
  entered: number;
  unit: UnitId;
  canonical: UnitId;
  stepKey: string | null;
  note: string;
  /** Minutes from the moment it is placed against (the check's start for a service, else completion). */
  offset: number;
}

/** Readings outside a check: a service's spot readings, and the re-test that proves a repair. */
function extraReadings(story: JobStory, truth: Truth, rng: Rng): ExtraReading[] {
  const reading = (
    quantity: Quantity,
    value: { value: number; unit: UnitId },
    stepKey: string | null,
    note: string,
    offset: number,
  ): ExtraReading => ({
    quantity,
    entered: value.value,
    unit: value.unit,
    canonical: CANONICAL_UNITS[quantity],
    stepKey,
    note,
    offset,
  });
  const mid = (truth.minPsi + truth.maxPsi) / 2;
  if (story === 'service') {
    const out = [
      reading('voltage', volts(rng.between(12.4, 12.8)), null, 'Battery at rest', 5),
      reading('voltage', volts(rng.between(13.6, 14.5)), null, 'Charging at raised revs', 35),
    ];
    if (rng.chance(0.4)) {
      for (let cylinder = 1; cylinder <= truth.cylinders; cylinder += 1) {
        out.push(
          reading('compression', { value: rng.int(140, 175), unit: 'psi' }, null, `cylinder ${cylinder}`, 20),
        );
      }
    }
    if (truth.cylinders > 1 || rng.chance(0.5)) {
      out.push(
        reading(
          'pressure',
          pressure(mid + rng.between(-1, 1), truth.gauge),
          null,
          'Fuel pressure at idle',
          40,
        ),
      );
    }
    return out;
  }
  if (story === 'weak-battery') {
    return [
      reading(
        'voltage',
        volts(rng.between(12.7, 12.95)),
        'battery-rest',
        'Re-test after repair: new battery at rest',
        -15,
      ),
      reading(
        'voltage',
        volts(rng.between(13.8, 14.4)),
        'charging-voltage',
        'Re-test after repair: charging',
        -8,
      ),
    ];
  }
  if (!FUEL_STORIES.has(story)) return [];
  const out: ExtraReading[] = [];
  if (story.startsWith('no-prime') || story === 'low-voltage') {
    out.push(
      reading(
        'duration',
        { value: rng.fixed(2, 3, 1), unit: 's' },
        'prime-run',
        'Re-test after repair: prime run',
        -25,
      ),
    );
  }
  const peak = mid + rng.between(-0.8, 0.8);
  for (const sec of [0, 30, 60, 120, 180, 240, 300]) {
    const value = pressure(
      peak - (sec >= 30 ? 1 : 0) - (sec > 30 ? ((sec - 30) / 60) * rng.between(0, 0.15) : 0),
      truth.gauge,
    );
    out.push(
      reading('pressure', value, 'static-pressure-hold', `Re-test after repair, ${sec} s`, -20 + sec / 60),
    );
  }
  for (const [phase, offset] of [
    ['idle', -12],
    ['snap', -11],
    ['held', -10],
  ] as const) {
    out.push(
      reading(
        'pressure',
        pressure(mid + rng.between(-0.8, 0.6), truth.gauge),
        'running-pressure',
        `Re-test after repair: ${phase}`,
        offset,
      ),
    );
  }
  return out;
}

/** Every table the large seed writes, and the ones the demo seed sets up beside them. */
export const SEEDED_TABLES: PgTable[] = [t.businesses, t.users, t.invoiceCounters, ...Object.values(TABLES)];

/** Rows per table, by SQL name. */
export async function tableCounts(db: Db): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const table of SEEDED_TABLES) {
    const [row] = await queryRows<{ n: number }>(db, sql`select count(*)::int as n from ${table}`);
    counts[tableName(table)] = row?.n ?? 0;
  }
  return counts;
}

/**
 * A fingerprint of every row of every seeded table: the count and the sum of each row's text
 * hashed (order-free, so it reads a large table without sorting it).
 */
export async function tableChecksums(db: Db): Promise<Record<string, string>> {
  const sums: Record<string, string> = {};
  for (const table of SEEDED_TABLES) {
    const [row] = await queryRows<{ n: number; h: string | null }>(
      db,
      sql`select count(*)::int as n, sum(hashtext(x::text)::bigint)::text as h from ${table} x`,
    );
    sums[tableName(table)] = `${row?.n ?? 0}:${row?.h ?? '0'}`;
  }
  return sums;
}
