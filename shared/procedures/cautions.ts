/**
 * Safety cautions shown before a hazardous step and acknowledged before it runs (PRODUCT.md,
 * "Safety"). Each ends by deferring to the machine's service manual, local codes and licensed
 * practice: Vanbay's defaults are generic, not a specification.
 */
export const DEFER_LINE =
  "Follow the machine's service manual, local codes and licensed practice; Vanbay's limits are generic, not a specification.";

export const CAUTIONS = {
  'fuel-pressure': {
    title: 'Fuel under pressure',
    lines: [
      'Fuel under pressure sprays and ignites: relieve the pressure before opening any line or fitting the gauge.',
      'No sparks, flames or smoking; work ventilated with a Class B extinguisher at hand.',
      'Wear eye protection and fuel-resistant gloves; catch spilled fuel and dispose of it per local rules.',
    ],
  },
  'fuel-open': {
    title: 'Fuel flowing into a container',
    lines: [
      'Relieve the pressure before disconnecting the outlet line; point it into an approved, grounded container.',
      'No sparks, flames or smoking; work ventilated with a Class B extinguisher at hand.',
      'Wear eye protection and fuel-resistant gloves; dispose of the collected fuel per local rules.',
    ],
  },
  'live-circuit': {
    title: 'Probing a live circuit',
    lines: [
      'Back-probe the connector from behind the seal; never pierce the insulation.',
      'Keep the meter on the 12 V DC range and the probes off neighbouring pins.',
      'Fuel vapour may be present near the pump: no sparks.',
    ],
  },
  battery: {
    title: 'Battery terminals',
    lines: [
      'Batteries vent hydrogen: no sparks or flames at the terminals.',
      'Keep tools from bridging the terminals; wear eye protection.',
    ],
  },
  'running-engine': {
    title: 'Engine running',
    lines: [
      'Keep hands, clothing and leads clear of belts, chains, wheels and the exhaust.',
      'Run the engine outdoors or with the exhaust vented; secure the machine in neutral.',
    ],
  },
  cranking: {
    title: 'Cranking with the plugs out',
    lines: [
      'Disable ignition and fuel as the service manual says before cranking with the plugs out.',
      'Fuel vapour leaves the plug holes: no sparks, flames or smoking; work ventilated.',
      'Keep clear of moving parts; eye protection on.',
    ],
  },
} as const satisfies Record<string, { title: string; lines: readonly string[] }>;

export type CautionKey = keyof typeof CAUTIONS;

/** The caution's lines with the deferral to the manual last, as shown and stored. */
export function cautionText(key: CautionKey): { title: string; lines: string[] } {
  const caution = CAUTIONS[key];
  return { title: caution.title, lines: [...caution.lines, DEFER_LINE] };
}
