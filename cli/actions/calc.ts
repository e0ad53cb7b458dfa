/**
 * `vanbay calc …`: the offline calculators of CONTRACT.md. No server, no sign-in; each answer is
 * computed by the same shared evaluators the checks use. A fail verdict is an answer (exit 0);
 * only input that cannot be read is an error (exit 2).
 */
import type { Command } from 'commander';
import { BATTERY_TYPES, evaluateBatteryRest } from '../../shared/evaluators/battery';
import { evaluateCompression } from '../../shared/evaluators/compression';
import { evaluateFlowVolume, GENERIC_MIN_FLOW_LPH } from '../../shared/evaluators/flow-volume';
import { evaluateMixture, FUELS } from '../../shared/evaluators/mixture';
import { evaluatePressureHold } from '../../shared/evaluators/pressure-hold';
import { clean, round, type Evaluation } from '../../shared/evaluators/types';
import { DEFAULT_MAX_DROP_VOLTS, evaluateVoltageDrop } from '../../shared/evaluators/voltage-drop';
import { mileageDeductionCents, ratesInYear } from '../../shared/mileage';
import {
  convert,
  findUnit,
  kpaToPsi,
  parseMeasurement,
  psiToKpa,
  UnitError,
  UNITS,
} from '../../shared/units';
import { isValidVin, modelYearsFromVin, vinCheckDigit } from '../../shared/vin';
import { UsageError, type CliDeps } from '../lib/deps';
import { theme } from '../ui/theme';

/** A plain decimal number as typed: `12.4`, `-40`, `.5`; no units, no hex, no `1e3` surprises. */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)$/;

function number(text: string, what: string): number {
  if (!DECIMAL.test(text.trim())) throw new UsageError(`${what} must be a number, got "${text}"`);
  return Number(text);
}

function positive(text: string, what: string): number {
  const value = number(text, what);
  if (value <= 0) throw new UsageError(`${what} must be above zero, got ${text}`);
  return value;
}

/** Evaluators refuse impossible numbers with a RangeError and units with a UnitError: bad input. */
function judged<T>(compute: () => T): T {
  try {
    return compute();
  } catch (error) {
    if (error instanceof RangeError || error instanceof UnitError) throw new UsageError(error.message);
    throw error;
  }
}

function oneOf<T extends string>(value: string, allowed: readonly T[], what: string): T {
  const lower = value.toLowerCase();
  const match = allowed.find((a) => a === lower);
  if (!match) throw new UsageError(`unknown ${what} "${value}" (one of ${allowed.join(', ')})`);
  return match;
}

/** Units `calc convert` accepts (CONTRACT.md), by the names printed back. */
const CONVERTIBLE = [
  'psi',
  'kPa',
  'bar',
  'mL',
  'L',
  'gal',
  'floz',
  'L/h',
  'mL/min',
  'gal/h',
  'mi',
  'km',
  'F',
  'C',
] as const;

function unitArg(text: string) {
  const unit = findUnit(text);
  if (!unit || !(CONVERTIBLE as readonly string[]).includes(unit)) {
    throw new UsageError(`unknown unit "${text}" (one of ${CONVERTIBLE.join(', ')})`);
  }
  return unit;
}

export function runConvert(valueText: string, fromText: string, toText: string) {
  const value = number(valueText, 'VALUE');
  const from = unitArg(fromText);
  const to = unitArg(toText);
  if (UNITS[from].dimension !== UNITS[to].dimension) {
    throw new UsageError(
      `cannot convert ${from} (${UNITS[from].dimension}) to ${to} (${UNITS[to].dimension})`,
    );
  }
  return { value: clean(convert(value, from, to)), unit: to };
}

export function runBattery(voltsText: string, typeText: string) {
  const type = oneOf(typeText, BATTERY_TYPES, 'battery type');
  const result = judged(() => evaluateBatteryRest({ volts: number(voltsText, 'VOLTS'), type }));
  return {
    stateOfChargePct: result.figures.stateOfChargePct,
    verdict: result.verdict,
    reason: result.reason,
  };
}

export function runDrop(supplyText: string, loadText: string, maxText: string | undefined) {
  const result = judged(() =>
    evaluateVoltageDrop({
      supplyVolts: number(supplyText, 'SUPPLY_VOLTS'),
      loadVolts: number(loadText, 'LOAD_VOLTS'),
      maxDropVolts: maxText === undefined ? DEFAULT_MAX_DROP_VOLTS : positive(maxText, '--max'),
    }),
  );
  return {
    dropVolts: result.figures.dropVolts,
    maxDropVolts: result.figures.maxDropVolts,
    verdict: result.verdict,
    reason: result.reason,
  };
}

export function runLambda(afrText: string, fuelText: string) {
  const fuel = oneOf(fuelText, FUELS, 'fuel');
  const result = judged(() => evaluateMixture({ afr: positive(afrText, 'AFR'), fuel }));
  const { lambda, stoichAfr, mixture } = result.figures;
  return { lambda, stoichAfr, mixture, verdict: result.verdict, reason: result.reason };
}

/** `0:43,30:42,300:41` (psi); a value may carry its own pressure unit, e.g. `30:2.9bar`. */
function holdPoints(text: string) {
  const pairs = text.split(',').map((p) => p.trim());
  return pairs.map((pair) => {
    const match = /^([^:]+):(.+)$/.exec(pair);
    if (!match) throw new UsageError(`--points: "${pair}" is not SEC:PSI`);
    const sec = number(match[1]!, '--points seconds');
    if (sec < 0) throw new UsageError(`--points: seconds cannot be negative ("${pair}")`);
    const pressure = judged(() => parseMeasurement(match[2]!, { dimension: 'pressure', defaultUnit: 'psi' }));
    return { sec, kpa: convert(pressure.value, pressure.unit, 'kPa') };
  });
}

export function runHold(pointsText: string, maxDropText: string, minutesText: string) {
  const points = holdPoints(pointsText);
  if (new Set(points.map((p) => p.sec)).size !== points.length)
    throw new UsageError('--points: a time appears twice');
  const maxDropPsi = number(maxDropText, '--max-drop');
  if (maxDropPsi < 0) throw new UsageError('--max-drop cannot be negative');
  const minutes = positive(minutesText, '--minutes');
  const result = judged(() =>
    evaluatePressureHold({ points, maxDropKpa: psiToKpa(maxDropPsi), minutes, specSource: 'manual' }),
  );
  // Back to the unit typed; six decimals hides the kPa round trip and keeps any gauge's resolution.
  const psi = (kpa: number) => round(kpaToPsi(kpa), 6);
  return {
    verdict: result.verdict,
    dropPsi: psi(result.figures.dropKpa),
    startPsi: psi(result.figures.startKpa),
    lowestPsi: psi(result.figures.lowestKpa),
    maxDropPsi,
    minutes,
    reason: result.reason,
  };
}

export function runFlow(mlText: string, secondsText: string, minText: string | undefined) {
  const ml = number(mlText, '--ml');
  if (ml < 0) throw new UsageError('--ml cannot be negative');
  const seconds = positive(secondsText, '--seconds');
  const manual = minText !== undefined;
  const result = judged(() =>
    evaluateFlowVolume({
      ml,
      seconds,
      minLph: manual ? positive(minText, '--min-lph') : GENERIC_MIN_FLOW_LPH,
      specSource: manual ? 'manual' : 'generic',
    }),
  );
  return {
    litersPerHour: result.figures.litersPerHour,
    minLph: result.figures.minLph,
    specSource: result.figures.specSource,
    verdict: result.verdict,
    reason: result.reason,
  };
}

export function runCompression(values: string[]) {
  if (values.length === 0)
    throw new UsageError('give one reading per cylinder, e.g. calc compression 165 160 158');
  const kpa = values.map((text) => {
    const reading = judged(() => parseMeasurement(text, { dimension: 'pressure', defaultUnit: 'psi' }));
    if (reading.value <= 0) throw new UsageError(`compression must be above zero, got ${text}`);
    return convert(reading.value, reading.unit, 'kPa');
  });
  const result = judged(() => evaluateCompression({ kpa }));
  return {
    spreadPct: result.figures.spreadPct,
    lowestPctOfHighest: result.figures.lowestPctOfHighest,
    verdict: result.verdict,
    reason: result.reason,
  };
}

export function runVin(vin: string) {
  const checkDigit = vinCheckDigit(vin);
  return { valid: isValidVin(vin), checkDigit, modelYears: modelYearsFromVin(vin) };
}

/** A rate in cents with at most one decimal (the IRS has used 65.5 ¢), as tenths of a cent. */
function rateTenths(text: string): number {
  if (!/^\d+(?:\.\d)?$/.test(text.trim()))
    throw new UsageError(`--rate must be cents per mile like 72.5, got "${text}"`);
  return Math.round(Number(text) * 10);
}

export function runMileage(milesText: string, yearText: string, rateText: string | undefined) {
  if (!/^\d+(?:\.\d{1,3})?$/.test(milesText.trim())) {
    throw new UsageError(`MILES must be a distance like 1234.5, got "${milesText}"`);
  }
  if (!/^\d{4}$/.test(yearText.trim()))
    throw new UsageError(`--year must be a year like 2026, got "${yearText}"`);
  const year = Number(yearText);
  let tenths: number;
  if (rateText !== undefined) {
    tenths = rateTenths(rateText);
  } else {
    const rates = ratesInYear(year);
    if (rates.length === 0)
      throw new UsageError(`no standard mileage rate known for ${year}: give --rate CENTS`);
    if (rates.length > 1) {
      const list = rates.map((r) => `${r.tenthsOfCentPerMile / 10} ¢ from ${r.from}`).join(', ');
      throw new UsageError(`${year} had more than one rate (${list}): give --rate CENTS`);
    }
    tenths = rates[0]!.tenthsOfCentPerMile;
  }
  const deductionCents = judged(() => mileageDeductionCents(milesText.trim(), tenths));
  return { rateCentsPerMile: tenths / 10, deductionCents, year };
}

type Printable = Record<string, unknown> & { verdict?: Evaluation['verdict']; reason?: string };

function print(deps: CliDeps, command: Command, result: Printable, headline: string) {
  // No zod here: `calc` stays offline and quick to start, and commander gives `--json` as a boolean.
  if (command.opts<{ json?: boolean }>().json) {
    deps.stdout.write(`${JSON.stringify(result)}\n`);
    return;
  }
  const verdict = result.verdict ? `  ${theme[result.verdict](result.verdict.toUpperCase())}` : '';
  deps.stdout.write(`${headline}${verdict}\n`);
  if (result.reason) deps.stdout.write(`${theme.muted(result.reason)}\n`);
}

const cents = (value: number) => `$${(value / 100).toFixed(2)}`;

export function calcConvertAction(
  deps: CliDeps,
  value: string,
  from: string,
  to: string,
  _o: unknown,
  command: Command,
) {
  const result = runConvert(value, from, to);
  // The JSON keeps every digit; the line for the eye keeps four decimals.
  print(deps, command, result, `${round(result.value, 4)} ${result.unit}`);
}

export function calcBatteryAction(deps: CliDeps, volts: string, options: { type: string }, command: Command) {
  const result = runBattery(volts, options.type);
  const soc = result.stateOfChargePct === null ? 'charge unknown' : `${result.stateOfChargePct} % charged`;
  print(deps, command, result, soc);
}

export function calcDropAction(
  deps: CliDeps,
  supply: string,
  load: string,
  options: { max?: string },
  command: Command,
) {
  const result = runDrop(supply, load, options.max);
  print(deps, command, result, `${result.dropVolts} V drop (limit ${result.maxDropVolts} V)`);
}

export function calcLambdaAction(deps: CliDeps, afr: string, options: { fuel: string }, command: Command) {
  const result = runLambda(afr, options.fuel);
  print(
    deps,
    command,
    result,
    `λ ${result.lambda} — ${result.mixture} (stoichiometric ${result.stoichAfr}:1)`,
  );
}

export function calcHoldAction(
  deps: CliDeps,
  options: { points: string; maxDrop: string; minutes: string },
  command: Command,
) {
  const result = runHold(options.points, options.maxDrop, options.minutes);
  print(deps, command, result, `fell ${result.dropPsi} psi (limit ${result.maxDropPsi} psi)`);
}

export function calcFlowAction(
  deps: CliDeps,
  options: { ml: string; seconds: string; minLph?: string },
  command: Command,
) {
  const result = runFlow(options.ml, options.seconds, options.minLph);
  print(deps, command, result, `${result.litersPerHour} L/h (minimum ${result.minLph} L/h)`);
}

export function calcCompressionAction(deps: CliDeps, values: string[], _o: unknown, command: Command) {
  const result = runCompression(values);
  print(deps, command, result, `spread ${result.spreadPct} %`);
}

export function calcVinAction(deps: CliDeps, vin: string, _o: unknown, command: Command) {
  const result = runVin(vin);
  const years = result.modelYears.length > 0 ? `  model year ${result.modelYears.join(' or ')}` : '';
  const headline = result.valid
    ? `${theme.pass('valid')}  check digit ${result.checkDigit}${years}`
    : `${theme.fail('not valid')}  ${result.checkDigit === null ? 'not a 17-character VIN (no I, O or Q)' : `check digit should be ${result.checkDigit}`}${years}`;
  print(deps, command, result, headline);
}

export function calcMileageAction(
  deps: CliDeps,
  miles: string,
  options: { year: string; rate?: string },
  command: Command,
) {
  const result = runMileage(miles, options.year, options.rate);
  print(deps, command, result, `${cents(result.deductionCents)} at ${result.rateCentsPerMile} ¢/mi`);
}
