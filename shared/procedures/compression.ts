/**
 * Compression: a dry test of every cylinder, then a wet test of the low ones to tell rings from
 * valves or the head gasket (REFERENCES.md, "Compression and leak-down": common practice).
 */
import { FINISH, type ProcedureDefinition } from './types';

export const compression: ProcedureDefinition = {
  key: 'compression',
  version: 1,
  title: 'Compression check',
  summary: 'Dry compression of each cylinder, then a wet test when one is low.',
  start: 'compression-dry',
  steps: {
    'compression-dry': {
      key: 'compression-dry',
      title: 'Dry compression',
      prompt:
        'Engine warm, plugs out, throttle held open: crank each cylinder until the gauge stops rising, and note it.',
      caution: 'cranking',
      evaluator: 'compression',
      fields: [
        {
          key: 'cylinders',
          type: 'list',
          quantity: 'compression',
          defaultUnit: 'psi',
          label: 'Compression per cylinder',
          itemLabel: 'cylinder',
          minItems: 1,
          maxItems: 12,
        },
      ],
      findings: [{ when: { verdict: ['fail', 'warn'] }, finding: 'compression-low' }],
      next: [{ when: { verdict: ['fail', 'warn'] }, goto: 'compression-wet' }, { goto: FINISH }],
    },
    'compression-wet': {
      key: 'compression-wet',
      title: 'Wet compression',
      prompt: 'Put a teaspoon of engine oil into each cylinder and repeat the test in the same order.',
      caution: 'cranking',
      evaluator: 'wet-test',
      fields: [
        {
          key: 'cylinders',
          type: 'list',
          quantity: 'compression',
          defaultUnit: 'psi',
          label: 'Wet compression per cylinder',
          itemLabel: 'cylinder',
          minItems: 1,
          maxItems: 12,
          sameCountAs: 'compression-dry',
        },
      ],
      findings: [
        { when: { figure: { key: 'cause', in: ['rings'] } }, finding: 'worn-rings' },
        { when: { figure: { key: 'cause', in: ['valves_or_gasket'] } }, finding: 'valves-or-gasket' },
      ],
      next: [{ goto: FINISH }],
    },
  },
  findings: {
    'compression-low': {
      key: 'compression-low',
      title: 'Compression low or uneven',
      detail: 'One or more cylinders seal poorly.',
      nextAction: 'Run the wet test, then a leak-down test to find where the pressure goes.',
      lines: [{ kind: 'labour', description: 'Compression test and report', quantity: 0.6 }],
    },
    'worn-rings': {
      key: 'worn-rings',
      title: 'Worn rings or cylinder',
      detail: 'Oil sealed the rings for a moment and compression rose.',
      nextAction: 'Quote a top-end rebuild (rings, and bore if worn) per the service manual.',
      lines: [{ kind: 'labour', description: 'Top-end inspection', quantity: 2 }],
    },
    'valves-or-gasket': {
      key: 'valves-or-gasket',
      title: 'Valves or head gasket leaking',
      detail: 'Oil did not help, so the pressure escapes past a valve or the gasket.',
      nextAction: 'Leak-down test to tell valves from gasket; check valve clearance first.',
      lines: [{ kind: 'labour', description: 'Leak-down test and valve clearance check', quantity: 1 }],
    },
  },
  advice: [
    'Test compression with the engine warm and the battery charged, so cranking speed is the same each time.',
  ],
};
