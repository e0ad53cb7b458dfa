/**
 * The limits a check judges against: the machine's service-manual figures where the mechanic
 * entered them, else Vanbay's generic defaults, always labelled as such.
 */
import { GENERIC_MIN_FLOW_LPH } from '../evaluators/flow-volume';
import type { SpecSource } from '../evaluators/types';
import { psiToKpa } from '../units';

/** Machine spec columns as stored (kPa, minutes, L/h); null where the manual gave nothing. */
export interface MachineSpec {
  fuelPressureMinKpa?: number | null;
  fuelPressureMaxKpa?: number | null;
  holdMaxDropKpa?: number | null;
  holdMinutes?: number | null;
  flowMinLph?: number | null;
}

export interface ResolvedSpec {
  fuelPressureMinKpa: number;
  fuelPressureMaxKpa: number;
  holdMaxDropKpa: number;
  holdMinutes: number;
  flowMinLph: number;
  /** Per limit, where it came from. */
  sources: Record<keyof MachineSpec, SpecSource>;
}

/**
 * Generic port-injection figures: a band around the common 43 psi (3 bar), a couple of psi of
 * fall over five minutes after settling, 30 L/h of flow — common practice, no published source
 * (REFERENCES.md, "Fuel delivery"); a machine's service manual always wins.
 */
export const GENERIC_FUEL_SPEC = {
  fuelPressureMinKpa: psiToKpa(39),
  fuelPressureMaxKpa: psiToKpa(47),
  holdMaxDropKpa: psiToKpa(3),
  holdMinutes: 5,
  flowMinLph: GENERIC_MIN_FLOW_LPH,
} as const satisfies Required<{ [K in keyof MachineSpec]: number }>;

export function resolveSpec(spec: MachineSpec | null | undefined): ResolvedSpec {
  const pick = (key: keyof MachineSpec) => {
    const value = spec?.[key];
    return typeof value === 'number' && Number.isFinite(value)
      ? { value, source: 'manual' as const }
      : { value: GENERIC_FUEL_SPEC[key], source: 'generic' as const };
  };
  const min = pick('fuelPressureMinKpa');
  const max = pick('fuelPressureMaxKpa');
  const drop = pick('holdMaxDropKpa');
  const minutes = pick('holdMinutes');
  const flow = pick('flowMinLph');
  return {
    fuelPressureMinKpa: min.value,
    fuelPressureMaxKpa: max.value,
    holdMaxDropKpa: drop.value,
    holdMinutes: minutes.value,
    flowMinLph: flow.value,
    sources: {
      fuelPressureMinKpa: min.source,
      fuelPressureMaxKpa: max.source,
      holdMaxDropKpa: drop.source,
      holdMinutes: minutes.source,
      flowMinLph: flow.source,
    },
  };
}

/** What a run is judged against: the machine's limits and what is known of it before the run. */
export interface RunContext {
  spec?: MachineSpec | null;
}
