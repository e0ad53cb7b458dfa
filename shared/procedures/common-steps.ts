/** Steps more than one procedure asks, written once. */
import { FINISH, type StepDefinition } from './types';

/** The battery at rest: a flat battery makes every later electrical or fuel test lie, so it ends the run. */
export function batteryRestStep(key: string, options: { finding: string; next: string }): StepDefinition {
  return {
    key,
    title: 'Battery at rest',
    prompt:
      'Measure the battery across its terminals after 1–2 h at rest (or with the surface charge removed).',
    caution: 'battery',
    evaluator: 'battery-rest',
    fields: [
      {
        key: 'batteryType',
        type: 'choice',
        label: 'Battery type',
        options: [
          { value: 'flooded', label: 'Flooded lead-acid' },
          { value: 'agm', label: 'AGM' },
          { value: 'lithium', label: 'Lithium (LiFePO4)' },
        ],
      },
      { key: 'volts', type: 'measurement', quantity: 'voltage', defaultUnit: 'V', label: 'Resting voltage' },
    ],
    findings: [{ when: { verdict: ['fail'] }, finding: options.finding }],
    next: [{ when: { verdict: ['fail'] }, goto: FINISH }, { goto: options.next }],
  };
}
