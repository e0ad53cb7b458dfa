/**
 * The customer's diagnostic report of a job: gathered here, in the actor's scope, and worded for
 * the customer; drawn by server/pdf/report-pdf.ts. Every verdict and reason is what the shared
 * engine derives when each stored run is walked again with the limits it started with (the run's
 * spec snapshot), never a stored or client-sent verdict. Limits are named in the unit the
 * mechanic read the gauge in, each marked as from the service manual or as generic.
 */
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { and, asc, eq, ne } from 'drizzle-orm';
import { JOB_STATUS_LABELS } from '../../shared/api/jobs';
import type { Quantity } from '../../shared/api/readings';
import { SETTLE_SECONDS, type PressureHoldFigures } from '../../shared/evaluators/pressure-hold';
import { round, type SpecSource } from '../../shared/evaluators/types';
import { CAUTIONS, DEFER_LINE, type CautionKey } from '../../shared/procedures/cautions';
import { EngineError, type EvaluatedStep, type RunView } from '../../shared/procedures/engine';
import { findProcedure } from '../../shared/procedures/index';
import { resolveSpec, type MachineSpec, type ResolvedSpec } from '../../shared/procedures/specs';
import type {
  Field,
  ListValue,
  MeasurementValue,
  ProcedureDefinition,
  SeriesValue,
  StepAnswer,
} from '../../shared/procedures/types';
import { convert, UNITS, type UnitId } from '../../shared/units';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import {
  renderReportPdf,
  type HoldChart,
  type ReportCheck,
  type ReportDocument,
  type ReportLimit,
  type ReportReading,
  type ReportStep,
} from '../pdf/report-pdf';
import type { Paper } from '../pdf/invoice-pdf';
import { walkStoredRun, type RunRow } from './checks';
import { loadBusiness } from './invoices';
import { jobInScope, type JobInScope } from './readings';
import { found } from './scope';

export interface ReportPdfOptions {
  paper?: Paper;
  /** The clock reading that dates the report; the caller's (RouteDeps.now). */
  now?: Date;
}

const QUANTITY_WORDS: Record<Quantity, string> = {
  pressure: 'Fuel pressure',
  voltage: 'Voltage',
  flow: 'Flow',
  compression: 'Compression',
  afr: 'Air-fuel ratio',
  resistance: 'Resistance',
  duration: 'Time',
  volume: 'Volume',
  temperature: 'Temperature',
};

/** Decimals a stored value is shown to: finer than any gauge in the van reads. */
const STORED_PLACES: Partial<Record<string, number>> = {
  V: 2,
  mV: 0,
  ohm: 2,
  kohm: 3,
  ratio: 2,
  s: 1,
  mL: 1,
};

const RUN_STATUS_WORDS = { finished: 'Finished', paused: 'Paused', in_progress: 'Not finished' } as const;

const isUnit = (unit: string): unit is UnitId => Object.hasOwn(UNITS, unit);

/** `43 psi`, `12.45 V`, `14.2:1`: a number with its unit's short label. */
function withUnit(value: number, unit: string, places?: number): string {
  const shown = places === undefined ? String(value) : String(round(value, places));
  if (!isUnit(unit)) return `${shown}\u00a0${unit}`;
  const label = UNITS[unit].label;
  // A no-break space: a value never wraps away from its unit.
  return label.startsWith(':') ? `${shown}${label}` : `${shown}\u00a0${label}`;
}

/** A stored canonical value, to the places its unit deserves. */
function storedText(value: number, unit: string): string {
  return withUnit(value, unit, STORED_PLACES[unit] ?? 1);
}

/** A limit in the mechanic's unit, with the stored unit beside it when they differ. */
function limitText(canonical: number, canonicalUnit: UnitId, shownUnit: UnitId): string {
  if (shownUnit === canonicalUnit) return storedText(canonical, canonicalUnit);
  const shown = withUnit(convert(canonical, canonicalUnit, shownUnit), shownUnit, 1);
  return `${shown} (${storedText(canonical, canonicalUnit)})`;
}

function fieldAnswer(field: Field, value: StepAnswer[string]): string {
  switch (field.type) {
    case 'measurement': {
      const m = value as MeasurementValue;
      return withUnit(m.value, m.unit);
    }
    case 'choice':
      return field.options.find((o) => o.value === value)?.label ?? String(value);
    case 'choices': {
      const chosen = (value as string[]).map((v) => field.options.find((o) => o.value === v)?.label ?? v);
      return chosen.length > 0 ? chosen.join('; ') : 'none of these';
    }
    case 'series': {
      const series = value as SeriesValue;
      const first = series.points[0];
      const last = series.points.at(-1);
      if (!first || !last) return 'no readings';
      return `${series.points.length} readings from ${first.sec} s to ${last.sec} s: ${withUnit(first.value, series.unit)} falling to ${withUnit(last.value, series.unit)}`;
    }
    case 'list': {
      const list = value as ListValue;
      return list.values.map((v, i) => `${field.itemLabel} ${i + 1}: ${withUnit(v, list.unit)}`).join(', ');
    }
  }
}

/** The answer in plain words: each field given, labelled when the step asks for more than one. */
function answerText(procedure: ProcedureDefinition, step: EvaluatedStep): string {
  const definition = procedure.steps[step.stepKey];
  if (!definition) return '';
  const given = definition.fields.filter((field) => step.answer[field.key] !== undefined);
  if (given.length === 1) return fieldAnswer(given[0]!, step.answer[given[0]!.key]!);
  return given.map((field) => `${field.label}: ${fieldAnswer(field, step.answer[field.key]!)}`).join('; ');
}

/** The unit the mechanic read pressures in on this run (the hold's, else the first pressure typed). */
function pressureUnitOf(procedure: ProcedureDefinition, steps: readonly EvaluatedStep[]): UnitId {
  for (const step of steps) {
    const definition = procedure.steps[step.stepKey];
    for (const field of definition?.fields ?? []) {
      if (field.type === 'measurement' || field.type === 'series') {
        if (field.quantity !== 'pressure') continue;
        const value = step.answer[field.key] as MeasurementValue | SeriesValue | undefined;
        if (value) return value.unit;
      }
    }
  }
  return 'psi';
}

const worse = (a: SpecSource, b: SpecSource): SpecSource =>
  a === 'generic' || b === 'generic' ? 'generic' : 'manual';

/** The limits the walked steps were judged against: only those of steps that were answered. */
function limitsOf(procedure: ProcedureDefinition, view: RunView, spec: ResolvedSpec): ReportLimit[] {
  const used = new Set(view.steps.map((step) => procedure.steps[step.stepKey]?.evaluator));
  const pressure = pressureUnitOf(procedure, view.steps);
  const limits: ReportLimit[] = [];
  if (used.has('pressure-hold')) {
    limits.push(
      {
        label: 'Pressure the pump must build (low end of the band)',
        value: limitText(spec.fuelPressureMinKpa, 'kPa', pressure),
        source: spec.sources.fuelPressureMinKpa,
      },
      {
        label: `Largest fall allowed in the hold, after ${SETTLE_SECONDS} s of settling`,
        value: limitText(spec.holdMaxDropKpa, 'kPa', pressure),
        source: spec.sources.holdMaxDropKpa,
      },
      {
        label: 'Length of the hold',
        value: `${round(spec.holdMinutes, 1)} min`,
        source: spec.sources.holdMinutes,
      },
    );
  }
  if (used.has('running-pressure')) {
    const low = limitText(spec.fuelPressureMinKpa, 'kPa', pressure);
    const high = limitText(spec.fuelPressureMaxKpa, 'kPa', pressure);
    limits.push({
      label: 'Running pressure band (idle, throttle snap, held throttle)',
      value: `${low} to ${high}`,
      source: worse(spec.sources.fuelPressureMinKpa, spec.sources.fuelPressureMaxKpa),
    });
  }
  if (used.has('flow-volume')) {
    limits.push({
      label: 'Least flow the pump must deliver',
      value: `${storedText(spec.flowMinLph, 'L/h')} (${withUnit(convert(spec.flowMinLph, 'L/h', 'mL/min'), 'mL/min', 0)})`,
      source: spec.sources.flowMinLph,
    });
  }
  return limits;
}

/** A hold step's chart, in the unit its points were typed in, from the engine's own figures. */
function holdChartOf(step: EvaluatedStep, spec: ResolvedSpec): HoldChart | null {
  const series = step.answer.points as SeriesValue | undefined;
  const evaluation = step.evaluation;
  if (!series || !evaluation) return null;
  const figures = evaluation.figures as unknown as PressureHoldFigures;
  const unit = series.unit;
  const toShown = (kpa: number) => convert(kpa, 'kPa', unit);
  const endSec = figures.minutes * 60;
  const settled = series.points.find((p) => p.sec >= SETTLE_SECONDS);
  const start = settled && settled.sec <= endSec ? settled : null;
  const maxDrop = toShown(figures.maxDropKpa);
  return {
    unitLabel: UNITS[unit].label,
    points: series.points,
    settleSec: SETTLE_SECONDS,
    endSec,
    start,
    maxDrop,
    allowedLow: start ? start.value - maxDrop : null,
    specSource: spec.sources.holdMaxDropKpa,
    verdict: evaluation.verdict,
  };
}

function timeIn(timezone: string, instant: Date): string {
  return format(new TZDate(instant, timezone), 'd MMM yyyy, HH:mm');
}

/** "18 Nov 2026": day-month-year with the month named, as the invoice writes dates. */
function dayLabel(timezone: string, instant: Date): string {
  return format(new TZDate(instant, timezone), 'd MMM yyyy');
}

function checkOf(
  run: RunRow,
  procedure: ProcedureDefinition,
  view: RunView,
  spec: ResolvedSpec,
  timezone: string,
): ReportCheck {
  const steps: ReportStep[] = view.steps.map((step) => ({
    title: step.title,
    answer: answerText(procedure, step),
    verdict: step.evaluation?.verdict ?? null,
    reason: step.evaluation?.reason ?? null,
  }));
  const holds = view.steps
    .filter((step) => procedure.steps[step.stepKey]?.evaluator === 'pressure-hold')
    .flatMap((step) => holdChartOf(step, spec) ?? []);
  const outcome = view.outcome;
  const diagnosis = outcome?.diagnosis;
  return {
    title: procedure.title,
    summary: procedure.summary,
    statusLabel: RUN_STATUS_WORDS[run.status as keyof typeof RUN_STATUS_WORDS] ?? run.status,
    startedAt: timeIn(timezone, run.startedAt),
    verdict: outcome?.verdict ?? view.verdict,
    limits: limitsOf(procedure, view, spec),
    steps,
    holds,
    findings: (outcome?.findings ?? []).map((f) => ({
      title: f.title,
      detail: f.detail,
      nextAction: f.nextAction,
      verdict: f.verdict,
    })),
    causes:
      diagnosis && diagnosis.verdict !== 'pass'
        ? diagnosis.causes.slice(0, 3).map((c) => ({
            title: c.title,
            likelihood: c.likelihood,
            evidence: c.evidence,
          }))
        : [],
    nextAction: outcome?.nextAction ?? null,
    advice: outcome ? [...outcome.advice] : [],
    problem: null,
  };
}

/** A stored run that no longer walks (a broken record): the report says so rather than failing whole. */
function brokenCheck(run: RunRow, error: Error, timezone: string): ReportCheck {
  const procedure = findProcedure(run.procedureKey);
  return {
    title: procedure?.title ?? run.procedureKey,
    summary: procedure?.summary ?? '',
    statusLabel: RUN_STATUS_WORDS[run.status as keyof typeof RUN_STATUS_WORDS] ?? run.status,
    startedAt: timeIn(timezone, run.startedAt),
    verdict: null,
    limits: [],
    steps: [],
    holds: [],
    findings: [],
    causes: [],
    nextAction: null,
    advice: [],
    problem: `This check's record could not be read again (${error.message}); ask the mechanic for the readings.`,
  };
}

/** The run's limits: those it started with (its snapshot), else the machine's, for older runs. */
function specOfRun(run: RunRow, job: JobInScope): ResolvedSpec {
  return resolveSpec((run.spec as MachineSpec | null) ?? job.spec);
}

/**
 * Everything the report prints, read in the actor's scope: a job outside it (another business's,
 * or another customer's for a customer sign-in) is a 404 before anything else is read.
 */
export async function reportDocument(
  db: Db,
  actor: Actor,
  jobId: number,
  now: Date,
): Promise<ReportDocument> {
  const job = await jobInScope(db, actor, jobId);
  const businessId = job.businessId;
  const [row] = await db
    .select({ job: t.jobs, machine: t.machines, customer: t.customers })
    .from(t.jobs)
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .where(and(eq(t.jobs.businessId, businessId), eq(t.jobs.id, job.id)));
  const { job: jobRow, machine, customer } = found(row, 'job');
  const business = await loadBusiness(db, businessId);
  const timezone = business.timezone;

  // An abandoned run was given up part-way: it judged nothing the customer should rely on.
  const runs = await db
    .select()
    .from(t.checkRuns)
    .where(
      and(
        eq(t.checkRuns.businessId, businessId),
        eq(t.checkRuns.jobId, job.id),
        ne(t.checkRuns.status, 'abandoned'),
      ),
    )
    .orderBy(asc(t.checkRuns.startedAt), asc(t.checkRuns.id));
  const checks: ReportCheck[] = [];
  const cautionKeys: CautionKey[] = [];
  const stepTitles = new Map<string, string>();
  for (const run of runs) {
    let walked: Awaited<ReturnType<typeof walkStoredRun>>;
    try {
      walked = await walkStoredRun(db, job, run);
    } catch (error) {
      if (error instanceof EngineError || error instanceof RangeError) {
        checks.push(brokenCheck(run, error, timezone));
        continue;
      }
      throw error;
    }
    const { procedure, view } = walked;
    checks.push(checkOf(run, procedure, view, specOfRun(run, job), timezone));
    for (const step of view.steps) {
      stepTitles.set(`${run.id}:${step.stepKey}`, `${procedure.title}: ${step.title}`);
      const caution = procedure.steps[step.stepKey]?.caution;
      if (caution && !cautionKeys.includes(caution)) cautionKeys.push(caution);
    }
  }

  const readingRows = await db
    .select()
    .from(t.readings)
    .where(and(eq(t.readings.businessId, businessId), eq(t.readings.jobId, job.id)))
    .orderBy(asc(t.readings.takenAt), asc(t.readings.id));
  const readings: ReportReading[] = readingRows.map((reading) => {
    const takenIn =
      reading.checkRunId !== null && reading.stepKey !== null
        ? (stepTitles.get(`${reading.checkRunId}:${reading.stepKey}`) ?? reading.stepKey)
        : 'Taken by hand';
    return {
      takenAt: timeIn(timezone, reading.takenAt),
      quantity: QUANTITY_WORDS[reading.quantity],
      typed: withUnit(reading.enteredValue, reading.enteredUnit),
      stored: storedText(reading.value, reading.unit),
      takenIn: reading.note ? `${takenIn} (${reading.note})` : takenIn,
    };
  });

  const lines = await db
    .select()
    .from(t.lineItems)
    .where(and(eq(t.lineItems.businessId, businessId), eq(t.lineItems.jobId, job.id)))
    .orderBy(asc(t.lineItems.position), asc(t.lineItems.id));

  const visit = jobRow.arrivedAt ?? jobRow.scheduledAt;
  return {
    business: {
      name: business.name,
      ownerName: business.ownerName,
      addressLines: business.addressLines,
      phone: business.phone,
      email: business.email,
    },
    job: {
      id: jobRow.id,
      statusLabel: JOB_STATUS_LABELS[jobRow.status],
      visitDay: visit ? dayLabel(timezone, visit) : null,
      location: jobRow.location,
      complaint: jobRow.complaint,
      diagnosis: jobRow.diagnosis,
      workDone: jobRow.workDone,
      meterReading: jobRow.meterReading,
    },
    customer: { name: customer.name, email: customer.email },
    machine: {
      year: machine.year,
      make: machine.make,
      model: machine.model,
      vin: machine.vin,
      otherId: machine.otherId,
      meterUnit: machine.meterUnit,
    },
    checks,
    readings,
    work: lines.map((line) => ({
      kind: line.kind,
      description: line.description,
      quantityMilli: line.quantityMilli,
    })),
    // Each caution's own lines; the deferral they all end with is printed once, last.
    cautions: cautionKeys.map((key) => ({ title: CAUTIONS[key].title, lines: [...CAUTIONS[key].lines] })),
    deferLine: DEFER_LINE,
    preparedOn: dayLabel(timezone, now),
    generatedAt: now,
  };
}

/** The report's file name, as the download and the mail attachment offer it. */
export const reportFilename = (jobId: number) => `report-job-${jobId}.pdf`;

/** The report as a PDF, for the route and for the mail that attaches it. */
export async function reportPdf(
  db: Db,
  actor: Actor,
  jobId: number,
  options: ReportPdfOptions = {},
): Promise<{ filename: string; bytes: Buffer }> {
  const now = options.now ?? new Date();
  const document = await reportDocument(db, actor, jobId, now);
  const bytes = await renderReportPdf(document, options.paper ?? 'letter');
  return { filename: reportFilename(document.job.id), bytes };
}
