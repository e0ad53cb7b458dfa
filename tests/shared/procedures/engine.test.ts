import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFER_LINE, cautionText, CAUTIONS, type CautionKey } from '../../../shared/procedures/cautions';
import {
  answerStep,
  backStep,
  EngineError,
  isFieldShown,
  startRun,
  walkRun,
  type RunState,
} from '../../../shared/procedures/engine';
import { PROCEDURES, findProcedure } from '../../../shared/procedures/index';
import { parseFieldInput } from '../../../shared/procedures/input';
import { STEP_EVALUATORS } from '../../../shared/procedures/step-evaluators';
import {
  FINISH,
  type Field,
  type FieldValue,
  type ListValue,
  type ProcedureDefinition,
  type SeriesValue,
  type StepAnswer,
} from '../../../shared/procedures/types';
import { UNITS, type UnitId } from '../../../shared/units';

const procedures = Object.values(PROCEDURES) as ProcedureDefinition[];
const fuel = PROCEDURES['fuel-delivery'];

describe('procedures are sound data', () => {
  it.each(procedures.map((p) => [p.key, p] as const))(
    '%s: every branch, finding and evaluator exists',
    (_k, p) => {
      expect(p.steps[p.start]).toBeDefined();
      for (const step of Object.values(p.steps)) {
        expect(step.next.at(-1)!.when, `${step.key} must end with a default branch`).toBeUndefined();
        for (const branch of step.next) expect(branch.goto === FINISH || branch.goto in p.steps).toBe(true);
        for (const finding of step.findings ?? [])
          expect(p.findings[finding.finding], finding.finding).toBeDefined();
        if (step.evaluator) expect(STEP_EVALUATORS[step.evaluator], step.evaluator).toBeDefined();
        if (step.caution) expect(CAUTIONS[step.caution]).toBeDefined();
      }
    },
  );

  it.each(procedures.map((p) => [p.key, p] as const))(
    '%s: every step can be reached from the start',
    (_k, p) => {
      const seen = new Set<string>([p.start]);
      const queue = [p.start];
      while (queue.length > 0) {
        for (const branch of p.steps[queue.shift()!]!.next) {
          if (branch.goto !== FINISH && !seen.has(branch.goto)) {
            seen.add(branch.goto);
            queue.push(branch.goto);
          }
        }
      }
      expect([...seen].sort()).toEqual(Object.keys(p.steps).sort());
    },
  );

  it('puts a caution before every step that handles fuel under pressure, a live circuit or a battery', () => {
    // PRODUCT.md, "Safety": fuel under pressure, batteries venting hydrogen, probing live circuits.
    const hazardous = procedures.flatMap((p) =>
      Object.values(p.steps).filter((s) =>
        s.fields.some(
          (f) => 'quantity' in f && ['pressure', 'voltage', 'compression', 'volume'].includes(f.quantity),
        ),
      ),
    );
    expect(hazardous.length).toBeGreaterThan(5);
    for (const step of hazardous) expect(step.caution, step.key).toBeDefined();
  });

  it('ends every caution by deferring to the service manual, local codes and licensed practice', () => {
    for (const key of Object.keys(CAUTIONS) as CautionKey[]) {
      const text = cautionText(key);
      expect(text.lines.at(-1)).toBe(DEFER_LINE);
      expect(DEFER_LINE).toMatch(/service manual/);
      expect(DEFER_LINE).toMatch(/local codes/);
      expect(DEFER_LINE).toMatch(/licensed practice/);
    }
  });

  it('finds procedures by key and by the short names the CLI accepts', () => {
    expect(findProcedure('fuel')?.key).toBe('fuel-delivery');
    expect(findProcedure('battery')?.key).toBe('battery-charging');
    expect(findProcedure('compression')?.key).toBe('compression');
    expect(findProcedure('spark')).toBeNull();
  });
});

const battery = {
  stepKey: 'basics-battery',
  answer: { batteryType: 'flooded', volts: { value: 12.6, unit: 'V' } },
};

function afterSymptoms(): RunState {
  const result = answerStep(fuel, startRun(fuel), {
    stepKey: 'symptoms',
    answer: { symptoms: ['no_start'] },
  });
  if (!result.ok) throw new Error(result.error);
  return result.state;
}

describe('the engine refuses what does not fit and changes nothing', () => {
  it('asks for the caution to be acknowledged before a hazardous step', () => {
    const state = afterSymptoms();
    const refused = answerStep(fuel, state, battery);
    expect(refused).toEqual({ ok: false, error: expect.stringMatching(/acknowledge the caution/) });
    const accepted = answerStep(fuel, state, { ...battery, cautionAcknowledged: true });
    expect(accepted.ok).toBe(true);
    expect(state.steps).toHaveLength(1);
  });

  it.each([
    [
      'another step',
      { stepKey: 'prime-run', answer: {}, cautionAcknowledged: true },
      /current step is basics-battery/,
    ],
    [
      'an unknown field',
      { ...battery, answer: { ...battery.answer, extra: 1 }, cautionAcknowledged: true },
      /unknown field/,
    ],
    [
      'a missing field',
      { ...battery, answer: { batteryType: 'agm' }, cautionAcknowledged: true },
      /required/,
    ],
    [
      'a unit of the wrong kind',
      {
        ...battery,
        answer: { batteryType: 'agm', volts: { value: 12, unit: 'psi' } },
        cautionAcknowledged: true,
      },
      /not a unit of voltage/,
    ],
    [
      'an unknown unit',
      {
        ...battery,
        answer: { batteryType: 'agm', volts: { value: 12, unit: 'furlong' } },
        cautionAcknowledged: true,
      },
      /unknown unit/,
    ],
    [
      'a negative reading',
      {
        ...battery,
        answer: { batteryType: 'agm', volts: { value: -12, unit: 'V' } },
        cautionAcknowledged: true,
      },
      /negative/,
    ],
    [
      'a choice not offered',
      {
        ...battery,
        answer: { batteryType: 'nickel', volts: { value: 12, unit: 'V' } },
        cautionAcknowledged: true,
      },
      /choose one of/,
    ],
    [
      'not a number',
      {
        ...battery,
        answer: { batteryType: 'agm', volts: { value: 'twelve', unit: 'V' } },
        cautionAcknowledged: true,
      },
      /number/,
    ],
  ])('refuses %s', (_name, input, message) => {
    const state = afterSymptoms();
    const result = answerStep(fuel, state, input);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error).toMatch(message);
  });

  it('turns an impossible number an evaluator refuses into an error, not a crash', () => {
    // A prime run that "ran and stopped" in 0 s is impossible (the evaluator throws RangeError).
    let state = afterSymptoms();
    const steps = [
      { ...battery, cautionAcknowledged: true },
      { stepKey: 'basics-fuel', answer: { fuel: 'fresh' } },
      { stepKey: 'basics-air-filter', answer: { airFilter: 'clean' } },
      { stepKey: 'basics-fault-codes', answer: { faultCodes: 'none' } },
      { stepKey: 'basics-engine', answer: { engine: 'assumed' } },
    ];
    for (const step of steps) {
      const result = answerStep(fuel, state, step);
      if (!result.ok) throw new Error(result.error);
      state = result.state;
    }
    const result = answerStep(fuel, state, {
      stepKey: 'prime-run',
      answer: { primeRun: 'ran_stopped', seconds: { value: 0, unit: 's' } },
    });
    expect(result.ok).toBe(false);
  });

  it('rejects a recorded run that skips a step, answers after the finish, or dodges a caution', () => {
    const skipped: RunState = {
      ...startRun(fuel),
      steps: [{ stepKey: 'basics-battery', answer: battery.answer }],
    };
    expect(() => walkRun(fuel, skipped)).toThrow(EngineError);
    const uncautioned: RunState = {
      ...startRun(fuel),
      steps: [
        { stepKey: 'symptoms', answer: { symptoms: [] } },
        { stepKey: 'basics-battery', answer: battery.answer },
      ],
    };
    expect(() => walkRun(fuel, uncautioned)).toThrow(/caution/);
    const flat = { batteryType: 'flooded', volts: { value: 11, unit: 'V' } };
    const beyond: RunState = {
      ...startRun(fuel),
      steps: [
        { stepKey: 'symptoms', answer: { symptoms: [] } },
        { stepKey: 'basics-battery', answer: flat, cautionAcknowledged: true },
        { stepKey: 'basics-fuel', answer: { fuel: 'fresh' } },
      ],
    };
    expect(() => walkRun(fuel, beyond)).toThrow(/finished before/);
    expect(() => walkRun(PROCEDURES.compression, startRun(fuel))).toThrow(EngineError);
  });

  it('goes back a step by dropping the last answer', () => {
    const state = afterSymptoms();
    const answered = answerStep(fuel, state, { ...battery, cautionAcknowledged: true });
    if (!answered.ok) throw new Error(answered.error);
    const back = backStep(answered.state);
    expect(walkRun(fuel, back).current!.key).toBe('basics-battery');
    expect(back.steps).toEqual(state.steps);
  });
});

/** A valid answer for any field, drawn at random, in the field's own unit or another of its kind. */
function arbitraryValue(field: Field): fc.Arbitrary<FieldValue> {
  const sameKind = (unit: string) =>
    Object.keys(UNITS).filter(
      (u) => UNITS[u as keyof typeof UNITS].dimension === UNITS[unit as keyof typeof UNITS].dimension,
    );
  switch (field.type) {
    case 'choice':
      return fc.constantFrom(...field.options.map((o) => o.value));
    case 'choices':
      return fc.subarray(field.options.map((o) => o.value));
    case 'measurement':
      return fc.record({
        value: fc.double({ min: 0.5, max: 60, noNaN: true }),
        unit: fc.constant(field.defaultUnit),
      });
    case 'series':
      return fc.record<SeriesValue>({
        unit: fc.constantFrom(...(sameKind(field.defaultUnit) as UnitId[])),
        points: fc
          .uniqueArray(fc.integer({ min: 0, max: 400 }), { minLength: field.minPoints, maxLength: 8 })
          .chain((secs) =>
            fc.tuple(
              ...secs.map((sec) =>
                fc.double({ min: 1, max: 60, noNaN: true }).map((value) => ({ sec, value })),
              ),
            ),
          ),
      });
    case 'list':
      return fc.record({
        unit: fc.constant(field.defaultUnit),
        values: fc.array(fc.double({ min: 50, max: 250, noNaN: true }), { minLength: 1, maxLength: 4 }),
      });
  }
}

describe('any walk ends in a finding, and re-walking gives the same result', () => {
  it.each(procedures.map((p) => [p.key, p] as const))('%s', (_k, procedure) => {
    fc.assert(
      fc.property(fc.infiniteStream(fc.nat()), (seeds) => {
        let state = startRun(procedure);
        const pick = seeds[Symbol.iterator]();
        for (let guard = 0; guard < 40; guard += 1) {
          const view = walkRun(procedure, state);
          if (!view.current) break;
          const step = view.current;
          const answer: Record<string, FieldValue> = {};
          for (const field of step.fields) {
            const sample = fc.sample(arbitraryValue(field), { numRuns: 1, seed: pick.next().value })[0]!;
            answer[field.key] = sample;
          }
          // Hidden fields are dropped by the engine; keep those whose condition holds.
          for (const field of step.fields) if (!isFieldShown(field, answer)) delete answer[field.key];
          if (step.key === 'compression-wet') {
            const dryAnswer = state.steps.find((s) => s.stepKey === 'compression-dry')!.answer as StepAnswer;
            const dry = dryAnswer.cylinders as ListValue;
            answer.cylinders = { unit: 'psi', values: dry.values.map((v) => v * 1.05) };
          }
          const result = answerStep(procedure, state, {
            stepKey: step.key,
            answer,
            cautionAcknowledged: true,
          });
          if (!result.ok) throw new Error(`${step.key}: ${result.error}`);
          state = result.state;
        }
        const first = walkRun(procedure, state);
        expect(first.finished).toBe(true);
        expect(first.outcome!.nextAction.length).toBeGreaterThan(10);
        // Through JSON, as the server stores and reads it back.
        const again = walkRun(procedure, JSON.parse(JSON.stringify(state)) as RunState);
        expect(again).toEqual(first);
        return true;
      }),
      { numRuns: 60 },
    );
  });
});

describe('typed input, the same in a terminal and a web form', () => {
  const pressure = fuel.steps['running-pressure']!.fields[0]!;
  const hold = fuel.steps['static-pressure-hold']!.fields[0]!;
  const prime = fuel.steps['prime-run']!.fields[0]!;
  const symptoms = fuel.steps.symptoms!.fields[0]!;

  it.each([
    ['43', { value: 43, unit: 'psi' }],
    ['3bar', { value: 3, unit: 'bar' }],
    ['296 kPa', { value: 296, unit: 'kPa' }],
  ])('reads a pressure "%s"', (text, expected) => {
    expect(parseFieldInput(pressure, text)).toEqual({ ok: true, value: expected });
  });

  it('reads a series of seconds:value pairs in one unit', () => {
    expect(parseFieldInput(hold, '0:43, 30:42.5, 300:41')).toEqual({
      ok: true,
      value: {
        unit: 'psi',
        points: [
          { sec: 0, value: 43 },
          { sec: 30, value: 42.5 },
          { sec: 300, value: 41 },
        ],
      },
    });
    expect(parseFieldInput(hold, '0:3bar, 30:2.9bar')).toMatchObject({ ok: true, value: { unit: 'bar' } });
    expect(parseFieldInput(hold, '0:3bar, 30:42psi')).toEqual({
      ok: false,
      error: expect.stringMatching(/same unit/),
    });
    expect(parseFieldInput(hold, '43, 42')).toMatchObject({ ok: false });
  });

  it('reads a choice by number or value, and several at once', () => {
    expect(parseFieldInput(prime, '3')).toEqual({ ok: true, value: 'none' });
    expect(parseFieldInput(prime, 'ran_on')).toEqual({ ok: true, value: 'ran_on' });
    expect(parseFieldInput(prime, '9')).toMatchObject({ ok: false });
    expect(parseFieldInput(symptoms, '1, 4')).toEqual({
      ok: true,
      value: ['cuts_out_under_load', 'long_cranking'],
    });
  });

  it('refuses a voltage typed where a pressure is asked for', () => {
    expect(parseFieldInput(pressure, '12V')).toEqual({
      ok: false,
      error: expect.stringMatching(/expected pressure/),
    });
  });
});
