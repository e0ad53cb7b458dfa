/**
 * Fuel delivery: basics first, the prime run, voltage at the pump when it does not prime, the
 * static hold, running pressure under throttle, flow volume where the engine cannot run with the
 * gauge fitted, and the filters (PRODUCT.md, "Fuel delivery check"). Values are generic; the
 * machine's service manual governs.
 */
import { LEAN_SYMPTOMS } from '../evaluators/lean-running';
import { batteryRestStep } from './common-steps';
import { FINISH, type ProcedureDefinition } from './types';

const SYMPTOM_LABELS: Record<(typeof LEAN_SYMPTOMS)[number], string> = {
  cuts_out_under_load: 'Idles but cuts out under load',
  stumbles_on_acceleration: 'Stumbles or hesitates on acceleration',
  revs_then_cuts_out: 'Revs up, then cuts out',
  long_cranking: 'Cranks a long time before it starts',
  no_start: 'Will not start',
};

export const fuelDelivery: ProcedureDefinition = {
  key: 'fuel-delivery',
  version: 1,
  title: 'Fuel delivery check',
  summary: 'Finds a failing pump, a restriction or a supply fault, basics first.',
  start: 'symptoms',
  diagnosis: 'lean-running',
  steps: {
    symptoms: {
      key: 'symptoms',
      title: 'Symptoms',
      prompt: 'What does the machine do? Ask the rider and note every symptom that applies.',
      fields: [
        {
          key: 'symptoms',
          type: 'choices',
          label: 'Symptoms',
          options: LEAN_SYMPTOMS.map((value) => ({ value, label: SYMPTOM_LABELS[value] })),
        },
      ],
      next: [{ goto: 'basics-battery' }],
    },
    'basics-battery': batteryRestStep('basics-battery', { finding: 'battery-low', next: 'basics-fuel' }),
    'basics-fuel': {
      key: 'basics-fuel',
      title: 'Fuel condition',
      prompt: 'Look at and smell the fuel in the tank: fresh, or stale, varnished or with water?',
      evaluator: 'choice-verdict',
      fields: [
        {
          key: 'fuel',
          type: 'choice',
          label: 'Fuel',
          options: [
            { value: 'fresh', label: 'Fresh', verdict: 'pass', reason: 'Fuel is fresh.' },
            {
              value: 'unknown',
              label: 'Not sure',
              verdict: 'warn',
              reason: 'Fuel age unknown: fresh fuel rules it out.',
            },
            {
              value: 'stale',
              label: 'Stale, varnished or watery',
              verdict: 'fail',
              reason: 'Fuel is stale or contaminated: drain and refill before judging the pump.',
            },
          ],
        },
      ],
      findings: [{ when: { field: { key: 'fuel', in: ['stale'] } }, finding: 'stale-fuel' }],
      next: [{ goto: 'basics-air-filter' }],
    },
    'basics-air-filter': {
      key: 'basics-air-filter',
      title: 'Air filter',
      prompt: 'Check the air filter element.',
      evaluator: 'choice-verdict',
      fields: [
        {
          key: 'airFilter',
          type: 'choice',
          label: 'Air filter',
          options: [
            { value: 'clean', label: 'Clean', verdict: 'pass', reason: 'Air filter clean.' },
            {
              value: 'dirty',
              label: 'Dirty or blocked',
              verdict: 'warn',
              reason: 'Air filter dirty: replace it; it upsets the mixture.',
            },
          ],
        },
      ],
      findings: [{ when: { field: { key: 'airFilter', in: ['dirty'] } }, finding: 'air-filter' }],
      next: [{ goto: 'basics-fault-codes' }],
    },
    'basics-fault-codes': {
      key: 'basics-fault-codes',
      title: 'Stored fault codes',
      prompt: 'Read the stored fault codes as the service manual describes.',
      evaluator: 'choice-verdict',
      fields: [
        {
          key: 'faultCodes',
          type: 'choice',
          label: 'Fault codes',
          options: [
            { value: 'none', label: 'None stored', verdict: 'pass', reason: 'No fault codes stored.' },
            {
              value: 'stored',
              label: 'Codes stored',
              verdict: 'warn',
              reason: 'Fault codes stored: handle them per the service manual before going on.',
            },
          ],
        },
      ],
      findings: [{ when: { field: { key: 'faultCodes', in: ['stored'] } }, finding: 'fault-codes' }],
      next: [{ goto: 'basics-engine' }],
    },
    'basics-engine': {
      key: 'basics-engine',
      title: 'Compression and spark',
      prompt: 'Are compression and spark known to be good?',
      evaluator: 'choice-verdict',
      fields: [
        {
          key: 'engine',
          type: 'choice',
          label: 'Compression and spark',
          options: [
            {
              value: 'confirmed',
              label: 'Confirmed good',
              verdict: 'pass',
              reason: 'Compression and spark good.',
            },
            {
              value: 'assumed',
              label: 'Assumed good',
              verdict: 'pass',
              reason: 'Compression and spark assumed good.',
            },
            {
              value: 'poor',
              label: 'Poor or missing',
              verdict: 'fail',
              reason: 'Compression or spark is poor: fix that before testing fuel delivery.',
            },
          ],
        },
      ],
      findings: [{ when: { field: { key: 'engine', in: ['poor'] } }, finding: 'engine-basics' }],
      next: [{ when: { field: { key: 'engine', in: ['poor'] } }, goto: FINISH }, { goto: 'prime-run' }],
    },
    'prime-run': {
      key: 'prime-run',
      title: 'Prime run',
      prompt:
        'Turn the key to run without cranking and listen at the tank: does the pump run briefly and stop?',
      evaluator: 'prime-run',
      fields: [
        {
          key: 'primeRun',
          type: 'choice',
          label: 'Pump at key-on',
          options: [
            { value: 'ran_stopped', label: 'Ran briefly and stopped' },
            { value: 'ran_on', label: 'Ran and kept running' },
            { value: 'none', label: 'Did not run' },
          ],
        },
        {
          key: 'seconds',
          type: 'measurement',
          quantity: 'duration',
          defaultUnit: 's',
          label: 'How long it ran',
          hint: 'About 2–3 s is typical.',
          showWhen: { field: 'primeRun', in: ['ran_stopped'] },
        },
      ],
      next: [
        { when: { field: { key: 'primeRun', in: ['none'] } }, goto: 'pump-connector-voltage' },
        { goto: 'static-pressure-hold' },
      ],
    },
    'pump-connector-voltage': {
      key: 'pump-connector-voltage',
      title: 'Voltage at the pump during prime',
      prompt:
        "Back-probe the pump connector's power and ground, meter on 12 V DC, and read the voltage while the key is turned on (the prime window).",
      caution: 'live-circuit',
      evaluator: 'pump-voltage',
      fields: [
        {
          key: 'volts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'Voltage at the pump',
        },
      ],
      findings: [
        { when: { figure: { key: 'state', in: ['present'] } }, finding: 'pump-failed' },
        { when: { figure: { key: 'state', in: ['absent'] } }, finding: 'no-supply' },
      ],
      next: [
        { when: { figure: { key: 'state', in: ['low'] } }, goto: 'supply-voltage-drop' },
        { goto: FINISH },
      ],
    },
    'supply-voltage-drop': {
      key: 'supply-voltage-drop',
      title: 'Voltage drop on the pump feed',
      prompt:
        'During the prime window, read the battery voltage and the voltage at the pump connector; the difference is lost in the wiring.',
      caution: 'live-circuit',
      evaluator: 'voltage-drop',
      fields: [
        {
          key: 'supplyVolts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'Battery voltage',
        },
        {
          key: 'loadVolts',
          type: 'measurement',
          quantity: 'voltage',
          defaultUnit: 'V',
          label: 'Voltage at the pump',
        },
      ],
      findings: [{ when: { verdict: ['fail', 'warn'] }, finding: 'supply-drop' }],
      next: [{ goto: FINISH }],
    },
    'static-pressure-hold': {
      key: 'static-pressure-hold',
      title: 'Static pressure hold',
      prompt:
        'Gauge fitted, key on, engine off: note the pressure when the pump stops, then every 30–60 s for the hold time.',
      caution: 'fuel-pressure',
      evaluator: 'pressure-hold',
      fields: [
        {
          key: 'points',
          type: 'series',
          quantity: 'pressure',
          defaultUnit: 'psi',
          label: 'Pressure over time',
          hint: 'Seconds since the pump stopped and the pressure, e.g. 0:43, 30:42, 300:41.',
          minPoints: 2,
        },
      ],
      findings: [
        {
          when: { verdict: ['fail'], figure: { key: 'reachedSpec', in: [true] } },
          finding: 'check-valve-leak',
        },
      ],
      next: [{ goto: 'engine-runs' }],
    },
    'engine-runs': {
      key: 'engine-runs',
      title: 'Can it run with the gauge fitted?',
      prompt: 'Can the engine be started and run safely with the gauge in place?',
      fields: [
        {
          key: 'runs',
          type: 'choice',
          label: 'Engine runs with gauge',
          options: [
            { value: 'yes', label: 'Yes' },
            { value: 'no', label: "No — it will not run, or the gauge can't stay fitted" },
          ],
        },
      ],
      next: [
        { when: { field: { key: 'runs', in: ['no'] } }, goto: 'flow-volume' },
        { goto: 'running-pressure' },
      ],
    },
    'running-pressure': {
      key: 'running-pressure',
      title: 'Running pressure',
      prompt:
        'Engine running: read the gauge at idle, on a snap of the throttle, and at a held throttle opening.',
      caution: 'running-engine',
      evaluator: 'running-pressure',
      fields: [
        { key: 'idle', type: 'measurement', quantity: 'pressure', defaultUnit: 'psi', label: 'At idle' },
        {
          key: 'snap',
          type: 'measurement',
          quantity: 'pressure',
          defaultUnit: 'psi',
          label: 'On a throttle snap (lowest)',
        },
        {
          key: 'held',
          type: 'measurement',
          quantity: 'pressure',
          defaultUnit: 'psi',
          label: 'At held throttle',
        },
      ],
      findings: [{ when: { nonEmpty: 'highPhases' }, finding: 'regulator-high' }],
      next: [{ when: { nonEmpty: 'dipPhases' }, goto: 'flow-volume' }, { goto: 'filters' }],
    },
    'flow-volume': {
      key: 'flow-volume',
      title: 'Flow volume',
      prompt:
        'Relieve the pressure, run the outlet line into a graduated container, and run the pump for a set time.',
      caution: 'fuel-open',
      evaluator: 'flow-volume',
      fields: [
        {
          key: 'volume',
          type: 'measurement',
          quantity: 'volume',
          defaultUnit: 'mL',
          label: 'Fuel collected',
        },
        { key: 'seconds', type: 'measurement', quantity: 'duration', defaultUnit: 's', label: 'Time run' },
      ],
      next: [{ goto: 'filters' }],
    },
    filters: {
      key: 'filters',
      title: 'Fuel filters',
      prompt:
        'Check every filter the machine has (in-tank strainer and in-line filter) and when each was last changed.',
      evaluator: 'choice-verdict',
      fields: [
        {
          key: 'filters',
          type: 'choice',
          label: 'Filters',
          options: [
            {
              value: 'ok',
              label: 'Changed within their interval',
              verdict: 'pass',
              reason: 'Filters within their interval.',
            },
            {
              value: 'overdue',
              label: 'Past their interval',
              verdict: 'warn',
              reason: 'Filters past their interval: replace them.',
            },
            { value: 'unknown', label: 'Not known', verdict: 'warn', reason: 'Filter history unknown.' },
            {
              value: 'restricted',
              label: 'Found restricted or dirty',
              verdict: 'fail',
              reason: 'Filter or strainer restricted: replace it.',
            },
          ],
        },
      ],
      findings: [
        { when: { field: { key: 'filters', in: ['restricted', 'overdue'] } }, finding: 'restricted_filter' },
      ],
      next: [{ goto: FINISH }],
    },
  },
  findings: {
    'battery-low': {
      key: 'battery-low',
      title: 'Battery low',
      detail: 'A low battery gives false results in every later test.',
      nextAction:
        'Charge the battery fully, let it rest, and re-test; replace it if it will not hold a charge.',
      lines: [{ kind: 'labour', description: 'Battery charge and test', quantity: 0.3 }],
    },
    'stale-fuel': {
      key: 'stale-fuel',
      title: 'Stale or contaminated fuel',
      detail: 'Old fuel varnishes filters and injectors and runs poorly.',
      nextAction: 'Drain the tank and refill with fresh fuel; add stabiliser if the machine will be stored.',
      lines: [
        { kind: 'labour', description: 'Drain and refill fuel', quantity: 0.5 },
        { kind: 'supplies', description: 'Fuel stabiliser', quantity: 1 },
      ],
    },
    'air-filter': {
      key: 'air-filter',
      title: 'Air filter dirty',
      detail: 'A blocked air filter upsets the mixture.',
      nextAction: 'Replace the air filter element.',
      lines: [{ kind: 'part', description: 'Air filter element', quantity: 1 }],
    },
    'fault-codes': {
      key: 'fault-codes',
      title: 'Fault codes stored',
      detail: 'The engine control unit has recorded a fault.',
      nextAction: 'Handle each code per the service manual, clear them, and re-test.',
      lines: [],
    },
    'engine-basics': {
      key: 'engine-basics',
      title: 'Compression or spark poor',
      detail: 'Fuel delivery cannot be judged while the engine itself is not healthy.',
      nextAction: 'Run the compression check and a spark test first.',
      lines: [],
    },
    'pump-failed': {
      key: 'pump-failed',
      title: 'Fuel pump not running with supply present',
      detail: 'The pump receives voltage during the prime window but does not run: the pump has failed.',
      nextAction: 'Replace the fuel pump, then confirm the prime run and the pressure.',
      lines: [
        { kind: 'labour', description: 'Replace fuel pump', quantity: 1 },
        { kind: 'part', description: 'Fuel pump', quantity: 1 },
      ],
    },
    'no-supply': {
      key: 'no-supply',
      title: 'No voltage at the pump',
      detail:
        'The pump gets no voltage during prime: an open circuit or a control part upstream (fuse, relay, run/stop switch, tip-over sensor, ECU output, wiring).',
      nextAction:
        'Trace the pump circuit upstream: fuse, relay, run/stop switch, tip-over sensor, ECU output, wiring.',
      lines: [{ kind: 'labour', description: 'Trace fuel pump supply circuit', quantity: 0.75 }],
    },
    'supply-drop': {
      key: 'supply-drop',
      title: 'Voltage lost on the pump feed',
      detail:
        'The pump sees well under battery voltage: resistance in the wiring, a connector or the ground.',
      nextAction: 'Clean or repair the worst section of the feed or ground and re-test the drop.',
      lines: [
        { kind: 'labour', description: 'Repair fuel pump feed or ground', quantity: 0.75 },
        { kind: 'supplies', description: 'Terminals and heat-shrink', quantity: 1 },
      ],
    },
    'check-valve-leak': {
      key: 'check-valve-leak',
      title: 'Pressure does not hold',
      detail:
        "Pressure keeps falling after the pump stops: the pump's check valve (or an injector or the regulator) is leaking; it causes long cranking.",
      nextAction: 'Clamp the feed line to tell the pump from the injectors, then replace the leaking part.',
      lines: [
        { kind: 'labour', description: 'Replace fuel pump assembly', quantity: 1 },
        { kind: 'part', description: 'Fuel pump assembly', quantity: 1 },
      ],
    },
    'regulator-high': {
      key: 'regulator-high',
      title: 'Running pressure above spec',
      detail: 'Pressure above the band points at the regulator or a restricted return.',
      nextAction: 'Check the regulator and its return line against the manual.',
      lines: [{ kind: 'labour', description: 'Inspect fuel pressure regulator', quantity: 0.5 }],
    },
    restricted_filter: {
      key: 'restricted_filter',
      title: 'Restricted fuel filter or strainer',
      detail: 'The most common cause of low fuel pressure and lean running under load.',
      nextAction: 'Replace the in-line filter and the in-tank strainer, then re-test running pressure.',
      lines: [
        { kind: 'labour', description: 'Replace fuel filter and strainer', quantity: 0.8 },
        { kind: 'part', description: 'In-line fuel filter', quantity: 1 },
        { kind: 'part', description: 'In-tank fuel strainer', quantity: 1 },
      ],
    },
    worn_pump: {
      key: 'worn_pump',
      title: 'Worn fuel pump',
      detail: 'With filters and supply voltage good, a pump that cannot hold pressure under load is worn.',
      nextAction: 'Replace the fuel pump and re-test running pressure.',
      lines: [
        { kind: 'labour', description: 'Replace fuel pump', quantity: 1 },
        { kind: 'part', description: 'Fuel pump', quantity: 1 },
      ],
    },
    low_supply_voltage: {
      key: 'low_supply_voltage',
      title: 'Low supply voltage at the pump',
      detail: 'A pump short of voltage spins slowly and cannot keep up under load.',
      nextAction: 'Run a voltage-drop test on the pump feed and ground and repair the worst section.',
      lines: [{ kind: 'labour', description: 'Voltage-drop test and repair', quantity: 0.75 }],
    },
    restricted_pickup: {
      key: 'restricted_pickup',
      title: 'Restricted pick-up or fuel line',
      detail: 'Debris at the pick-up or a kinked line starves the pump.',
      nextAction: 'Inspect the pick-up, tank outlet and lines; clear or replace what is restricted.',
      lines: [{ kind: 'labour', description: 'Inspect pick-up and fuel lines', quantity: 0.5 }],
    },
    faulty_regulator: {
      key: 'faulty_regulator',
      title: 'Faulty pressure regulator',
      detail: 'Good flow at the pump but pressure that will not stay in the band points at the regulator.',
      nextAction: 'Test the regulator against the manual and replace it if it is out.',
      lines: [{ kind: 'labour', description: 'Test fuel pressure regulator', quantity: 0.5 }],
    },
  },
  advice: [
    'Change the fuel filters on their interval; some machines have both an in-tank strainer and an in-line filter.',
    'Keep the tank from running low: the fuel cools the pump.',
    'Pre-filter fuel from cans, and use a stabiliser before storage.',
  ],
};
