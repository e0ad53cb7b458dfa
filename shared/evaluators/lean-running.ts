/**
 * Lean running: the symptoms the rider reports and the verdicts of the fuel checks, combined into
 * probable causes ranked with the evidence for each.
 *
 * The starting order is the trade's (PRODUCT.md, "Lean running"): a restricted filter or
 * strainer is the most common cause of low fuel pressure, then a worn pump, low supply voltage,
 * a restricted pick-up or line, a faulty regulator. Each piece of evidence moves a cause up or
 * down by a weight; the weights are Vanbay's own judgement of how strongly a finding points at a
 * cause — common practice, no published source.
 */
import type { Verdict } from '../api/readings';
import type { Evaluation } from './types';

export const LEAN_SYMPTOMS = [
  'cuts_out_under_load',
  'stumbles_on_acceleration',
  'revs_then_cuts_out',
  'long_cranking',
  'no_start',
] as const;
export type LeanSymptom = (typeof LEAN_SYMPTOMS)[number];

export const LEAN_CAUSES = {
  restricted_filter: {
    title: 'Restricted fuel filter or in-tank strainer',
    nextAction: 'Replace the in-line filter and the in-tank strainer, then re-test running pressure.',
  },
  worn_pump: {
    title: 'Worn fuel pump',
    nextAction: 'With filters and supply voltage ruled out, replace the pump and re-test.',
  },
  low_supply_voltage: {
    title: 'Low supply voltage at the pump',
    nextAction: 'Run a voltage-drop test on the pump feed and ground; repair the worst section.',
  },
  restricted_pickup: {
    title: 'Restricted pick-up or fuel line',
    nextAction: 'Inspect the pick-up, the tank outlet and the lines for kinks, debris or collapse.',
  },
  faulty_regulator: {
    title: 'Faulty pressure regulator',
    nextAction: 'Check the regulator (and its return or vacuum line) against the manual.',
  },
  leaking_check_valve: {
    title: 'Leaking check valve in the pump (or a leaking injector or regulator)',
    nextAction:
      'Clamp-test the feed line to tell the pump from the injectors, then replace the leaking part.',
  },
} as const;
export type LeanCause = keyof typeof LEAN_CAUSES;

/** Starting score per cause: the trade's order of likelihood. */
const PRIOR: Record<LeanCause, number> = {
  restricted_filter: 3,
  worn_pump: 2,
  low_supply_voltage: 1.5,
  restricted_pickup: 1,
  faulty_regulator: 1,
  leaking_check_valve: 0,
};

/** The causes that starve the engine under load (all but the check valve). */
const STARVING: readonly LeanCause[] = [
  'restricted_filter',
  'worn_pump',
  'low_supply_voltage',
  'restricted_pickup',
  'faulty_regulator',
];

export type FilterState = 'ok' | 'overdue' | 'unknown' | 'restricted';

type Judged = Pick<Evaluation, 'verdict' | 'figures'>;

export interface LeanRunningInput {
  symptoms: readonly LeanSymptom[];
  runningPressure?: Judged;
  hold?: Judged;
  flow?: Judged;
  pumpVoltage?: Judged;
  supplyDrop?: Judged;
  filters?: FilterState;
}

export interface RankedCause {
  cause: LeanCause;
  title: string;
  score: number;
  likelihood: 'high' | 'medium' | 'low';
  evidence: string[];
  nextAction: string;
}

export interface LeanRunningDiagnosis {
  /** Whether the measurements (not only the symptoms) show fuel starvation. */
  starvationMeasured: boolean;
  causes: RankedCause[];
  verdict: Verdict;
  reason: string;
}

interface Nudge {
  causes: readonly LeanCause[];
  weight: number;
  evidence: string;
}

function figureList(judged: Judged | undefined, key: string): readonly (string | number)[] {
  const value = judged?.figures[key];
  return Array.isArray(value) ? value : [];
}

function symptomNudges(symptoms: readonly LeanSymptom[]): Nudge[] {
  const nudges: Nudge[] = [];
  const underLoad = symptoms.filter((s) => s !== 'long_cranking' && s !== 'no_start');
  if (underLoad.length > 0) {
    nudges.push({
      causes: STARVING,
      weight: 1,
      evidence: `Symptoms of starvation: ${underLoad.map((s) => s.replaceAll('_', ' ')).join(', ')}`,
    });
  }
  if (symptoms.includes('long_cranking')) {
    nudges.push({
      causes: ['leaking_check_valve'],
      weight: 1.5,
      evidence: 'Long cranking before it starts: pressure bleeding away while parked',
    });
  }
  return nudges;
}

function measuredNudges(input: LeanRunningInput): Nudge[] {
  const nudges: Nudge[] = [];
  const { runningPressure, hold, flow, pumpVoltage, supplyDrop, filters } = input;
  const dips = figureList(runningPressure, 'dipPhases');
  if (dips.length > 0) {
    nudges.push({
      causes: STARVING,
      weight: 2,
      evidence: `Running pressure dipped below spec (${dips.join(', ')})`,
    });
  }
  if (figureList(runningPressure, 'highPhases').length > 0 && dips.length === 0) {
    nudges.push({
      causes: ['faulty_regulator'],
      weight: 4,
      evidence: 'Running pressure above the spec band',
    });
  }
  if (runningPressure?.verdict === 'pass') {
    nudges.push({ causes: STARVING, weight: -2, evidence: 'Running pressure stayed in the spec band' });
  }
  if (hold?.verdict === 'fail' && hold.figures.peakKpa !== undefined) {
    const neverBuilt = hold.figures.reachedSpec === false;
    if (neverBuilt) {
      nudges.push({
        causes: ['worn_pump', 'restricted_filter', 'low_supply_voltage'],
        weight: 1.5,
        evidence: 'Pressure never reached spec at key-on',
      });
    } else {
      nudges.push({
        causes: ['leaking_check_valve'],
        weight: 4,
        evidence: 'Pressure kept falling after the pump stopped',
      });
    }
  }
  if (hold?.verdict === 'pass') {
    nudges.push({ causes: ['leaking_check_valve'], weight: -2, evidence: 'Static pressure held' });
  }
  if (flow?.verdict === 'fail') {
    nudges.push({
      causes: ['restricted_filter', 'worn_pump', 'restricted_pickup'],
      weight: 2,
      evidence: 'Flow volume below the minimum',
    });
  }
  if (flow?.verdict === 'pass' && dips.length > 0) {
    nudges.push({
      causes: ['faulty_regulator'],
      weight: 2,
      evidence: 'Flow at the pump is good while running pressure dips',
    });
  }
  const supplyLow =
    pumpVoltage?.figures.state === 'low' || (supplyDrop !== undefined && supplyDrop.verdict === 'fail');
  if (supplyLow) {
    nudges.push({
      causes: ['low_supply_voltage'],
      weight: 4,
      evidence: 'Voltage at the pump well under battery voltage',
    });
  } else if (pumpVoltage?.figures.state === 'present' || supplyDrop?.verdict === 'pass') {
    nudges.push({
      causes: ['low_supply_voltage'],
      weight: -2,
      evidence: 'Supply voltage at the pump is good',
    });
  }
  if (filters === 'restricted') {
    nudges.push({
      causes: ['restricted_filter'],
      weight: 4,
      evidence: 'Filter or strainer found restricted',
    });
  } else if (filters === 'overdue' || filters === 'unknown') {
    nudges.push({
      causes: ['restricted_filter'],
      weight: 1.5,
      evidence: filters === 'overdue' ? 'Filters past their interval' : 'Filter history unknown',
    });
  } else if (filters === 'ok') {
    nudges.push({ causes: ['restricted_filter'], weight: -1.5, evidence: 'Filters recently replaced' });
  }
  return nudges;
}

function likelihood(score: number): RankedCause['likelihood'] {
  if (score >= 6) return 'high';
  if (score >= 3.5) return 'medium';
  return 'low';
}

/** Ranks the probable causes; ties keep the trade's order. Causes with no support are left out. */
export function diagnoseLeanRunning(input: LeanRunningInput): LeanRunningDiagnosis {
  const nudges = [...symptomNudges(input.symptoms), ...measuredNudges(input)];
  const order = Object.keys(LEAN_CAUSES) as LeanCause[];
  const ranked = order.map((cause, index) => {
    const own = nudges.filter((n) => n.causes.includes(cause)).sort((a, b) => b.weight - a.weight);
    const score = own.reduce((sum, n) => sum + n.weight, PRIOR[cause]);
    const evidence = own.filter((n) => n.weight > 0).map((n) => n.evidence);
    const against = own
      .filter((n) => n.weight < 0)
      .reverse()
      .map((n) => `Against: ${n.evidence.toLowerCase()}`);
    return { cause, index, score, evidence: [...evidence, ...against] };
  });
  const supported = ranked
    .filter((r) => r.evidence.some((e) => !e.startsWith('Against')) && r.score > 0)
    .sort((a, b) => b.score - a.score || a.index - b.index)
    .map((r): RankedCause => ({
      cause: r.cause,
      title: LEAN_CAUSES[r.cause].title,
      score: r.score,
      likelihood: likelihood(r.score),
      evidence: r.evidence,
      nextAction: LEAN_CAUSES[r.cause].nextAction,
    }));
  const starvationMeasured =
    figureList(input.runningPressure, 'dipPhases').length > 0 ||
    input.flow?.verdict === 'fail' ||
    (input.hold?.verdict === 'fail' && input.hold.figures.reachedSpec === false);
  const top = supported[0];
  const verdict: Verdict =
    starvationMeasured || (top && top.likelihood === 'high') ? 'fail' : top ? 'warn' : 'pass';
  const reason = top
    ? `Most likely: ${top.title.toLowerCase()} (${top.evidence.filter((e) => !e.startsWith('Against'))[0]?.toLowerCase()}).`
    : 'No sign of fuel starvation in the measurements: look at ignition, air intake and sensors next.';
  return { starvationMeasured, causes: supported, verdict, reason };
}
