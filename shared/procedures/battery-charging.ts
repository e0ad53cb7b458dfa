/**
 * Battery and charging: the battery at rest, its voltage while cranking, the charging voltage at
 * raised revs, and a voltage-drop test on the starting circuit when cranking is weak. Thresholds
 * are generic (REFERENCES.md, "Battery"); the machine's service manual governs.
 */
import { batteryRestStep } from './common-steps';
import { FINISH, type ProcedureDefinition } from './types';

export const batteryCharging: ProcedureDefinition = {
  key: 'battery-charging',
  version: 1,
  title: 'Battery and charging check',
  summary: 'Battery state of charge, cranking voltage, charging voltage and the starting circuit.',
  start: 'battery-rest',
  steps: {
    'battery-rest': batteryRestStep('battery-rest', {
      finding: 'battery-discharged',
      next: 'cranking-voltage',
    }),
    'cranking-voltage': {
      key: 'cranking-voltage',
      title: 'Cranking voltage',
      prompt: 'Meter on the battery terminals, read the lowest voltage while cranking for a few seconds.',
      caution: 'running-engine',
      evaluator: 'cranking-voltage',
      fields: [
        {
          key: 'volts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'Lowest while cranking',
        },
      ],
      findings: [{ when: { verdict: ['fail'] }, finding: 'weak-cranking' }],
      next: [
        { when: { verdict: ['fail', 'warn'] }, goto: 'starter-circuit-drop' },
        { goto: 'charging-voltage' },
      ],
    },
    'starter-circuit-drop': {
      key: 'starter-circuit-drop',
      title: 'Starting circuit voltage drop',
      prompt: 'While cranking, read the battery voltage and the voltage at the starter terminal.',
      caution: 'running-engine',
      evaluator: 'voltage-drop',
      fields: [
        {
          key: 'supplyVolts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'At the battery',
        },
        {
          key: 'loadVolts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'At the starter',
        },
      ],
      findings: [{ when: { verdict: ['fail'] }, finding: 'starter-cable-drop' }],
      next: [{ goto: 'charging-voltage' }],
    },
    'charging-voltage': {
      key: 'charging-voltage',
      title: 'Charging voltage',
      prompt:
        'Engine running at the revs the service manual gives for the test, read across the battery terminals.',
      caution: 'running-engine',
      evaluator: 'charging-voltage',
      fields: [
        { key: 'volts', type: 'measurement', quantity: 'voltage', defaultUnit: 'V', label: 'At raised revs' },
      ],
      findings: [{ when: { verdict: ['fail', 'warn'] }, finding: 'charging-fault' }],
      next: [{ goto: FINISH }],
    },
  },
  findings: {
    'battery-discharged': {
      key: 'battery-discharged',
      title: 'Battery discharged',
      detail: 'The battery is too low to test the rest of the system.',
      nextAction: 'Charge fully, rest, and re-test; replace it if it will not hold a charge.',
      lines: [
        { kind: 'labour', description: 'Battery charge and test', quantity: 0.3 },
        { kind: 'part', description: 'Battery', quantity: 1 },
      ],
    },
    'weak-cranking': {
      key: 'weak-cranking',
      title: 'Voltage collapses while cranking',
      detail: 'A weak battery, a poor cable or ground, or a starter drawing too much.',
      nextAction: 'Load-test the battery and check the starting circuit for voltage drop.',
      lines: [{ kind: 'labour', description: 'Starting circuit test', quantity: 0.5 }],
    },
    'starter-cable-drop': {
      key: 'starter-cable-drop',
      title: 'Voltage lost in the starting circuit',
      detail: 'Resistance in a cable, a connection or the ground starves the starter.',
      nextAction: 'Clean and tighten the connections, or replace the worst cable, and re-test.',
      lines: [
        { kind: 'labour', description: 'Repair starter cable or ground', quantity: 0.5 },
        { kind: 'supplies', description: 'Terminals and heat-shrink', quantity: 1 },
      ],
    },
    'charging-fault': {
      key: 'charging-fault',
      title: 'Charging voltage out of band',
      detail: 'Too low and the battery runs down; too high and it is overcharged.',
      nextAction: 'Test the stator and the regulator/rectifier per the service manual.',
      lines: [{ kind: 'labour', description: 'Charging system test', quantity: 0.75 }],
    },
  },
  advice: [
    'Read a battery only after it has rested; a surface charge reads high.',
    'Keep a machine that is stored on a maintainer suited to its battery type.',
  ],
};
