import { z } from 'zod';
import { clean } from '../evaluators/types';
import { convert, dimensionOf, parseMeasurement, UnitError, UNITS, type UnitId } from '../units';
import { isValidVin, vinCheckDigit } from '../vin';
import { IdSchema, ListQuerySchema, listResponseSchema, optionalText, text } from './common';
import { JobStatusSchema } from './jobs';
import { CheckRunStatusSchema, VerdictSchema } from './readings';

export const MACHINE_KINDS = [
  'motorcycle',
  'atv',
  'side_by_side',
  'snowmobile',
  'watercraft',
  'small_engine',
] as const;
export const MachineKindSchema = z.enum(MACHINE_KINDS);
export type MachineKind = z.infer<typeof MachineKindSchema>;

/** How a machine counts its use: road machines by distance, most off-road and marine ones by hours. */
export const METER_UNITS = ['mi', 'km', 'h'] as const;
export const MeterUnitSchema = z.enum(METER_UNITS);
export type MeterUnit = z.infer<typeof MeterUnitSchema>;

/** Where a spec came from: the machine's service manual, or Vanbay's generic default. */
export const SPEC_SOURCES = ['manual', 'generic'] as const;
export const SpecSourceSchema = z.enum(SPEC_SOURCES);

export const MACHINES_PATH = '/api/machines';
export const machinePath = (id: number) => `${MACHINES_PATH}/${id}`;
export const machineHistoryPath = (id: number) => `${MACHINES_PATH}/${id}/history`;

/** How a machine is named on screens and in a job's detail: "2019 Kestrel Quillback 650". */
export function machineDisplayName(machine: { year: number | null; make: string; model: string }): string {
  return [machine.year, machine.make, machine.model].filter((part) => part !== null && part !== '').join(' ');
}

/**
 * The service-manual limits a machine may carry, each stored in its canonical unit (kPa, minutes,
 * L/h) with the unit in its name; null means "use the generic default".
 */
export const MACHINE_SPEC_KEYS = [
  'fuelPressureMinKpa',
  'fuelPressureMaxKpa',
  'holdMaxDropKpa',
  'holdMinutes',
  'flowMinLph',
] as const;
export type MachineSpecKey = (typeof MACHINE_SPEC_KEYS)[number];

/**
 * Canonical unit and accepted range of each spec. The ranges only catch slips (a psi figure typed
 * as kPa, a missing decimal point); they are wide on purpose and decide nothing about a machine.
 */
export const MACHINE_SPEC_LIMITS: Record<MachineSpecKey, { unit: UnitId; min: number; max: number }> = {
  fuelPressureMinKpa: { unit: 'kPa', min: 1, max: 1000 },
  fuelPressureMaxKpa: { unit: 'kPa', min: 1, max: 1000 },
  holdMaxDropKpa: { unit: 'kPa', min: 0, max: 1000 },
  holdMinutes: { unit: 'min', min: 0.5, max: 60 },
  flowMinLph: { unit: 'L/h', min: 0.1, max: 1000 },
};

/**
 * A spec as typed: a number already in the canonical unit, or text with its unit ("39psi",
 * "2.7 bar", "30 L/h", "5 min"), converted here so the dashboard and the server agree. A unit of
 * the wrong kind (a flow for a pressure) or a bare number in text is refused.
 */
function specInput(key: MachineSpecKey) {
  const { unit, min, max } = MACHINE_SPEC_LIMITS[key];
  const label = UNITS[unit].label;
  return z
    .union([z.number(), z.string().trim().min(1).max(40)])
    .transform((raw, ctx) => {
      let value: number;
      if (typeof raw === 'number') {
        value = raw;
      } else {
        if (/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(raw)) {
          ctx.addIssue({ code: 'custom', message: `"${raw}" needs a unit, e.g. ${raw} ${label}` });
          return z.NEVER;
        }
        try {
          const typed = parseMeasurement(raw, { dimension: dimensionOf(unit) });
          value = convert(typed.value, typed.unit, unit);
        } catch (error) {
          if (!(error instanceof UnitError)) throw error;
          ctx.addIssue({ code: 'custom', message: error.message });
          return z.NEVER;
        }
      }
      // Strips conversion noise so "2.7 bar" is stored as 270 kPa, not 270.00000000000006.
      value = clean(value);
      if (!Number.isFinite(value) || value < min || value > max) {
        ctx.addIssue({ code: 'custom', message: `must be between ${min} and ${max} ${label}` });
        return z.NEVER;
      }
      return value;
    })
    .nullish();
}

/**
 * A 17-character VIN checked against 49 CFR 565.15; a wrong check digit names the one expected,
 * so the mechanic can tell a mistyped character from a wrong position 9.
 */
export const VinSchema = z
  .string()
  .trim()
  .toUpperCase()
  .superRefine((vin, ctx) => {
    const expected = vinCheckDigit(vin);
    if (expected === null) {
      ctx.addIssue({
        code: 'custom',
        message: 'a VIN is 17 letters and digits, never I, O or Q (use otherId for a HIN or serial)',
      });
    } else if (!isValidVin(vin)) {
      ctx.addIssue({
        code: 'custom',
        message: `check digit (9th character) is ${vin[8]}, but this VIN needs ${expected}: a character is mistyped`,
        params: { expectedCheckDigit: expected },
      });
    }
  });

/** One spec as a check will use it: the manual's figure, else the generic one, and which it is. */
export const MachineSpecValueSchema = z.object({
  value: z.number(),
  source: SpecSourceSchema,
  genericValue: z.number(),
});
export type MachineSpecValue = z.infer<typeof MachineSpecValueSchema>;

export const MachineSchema = z.object({
  id: z.number().int(),
  customerId: z.number().int(),
  kind: MachineKindSchema,
  year: z.number().int().nullable(),
  make: z.string(),
  model: z.string(),
  vin: z.string().nullable(),
  /** HIN, frame or engine serial for machines without a VIN; free text, not validated. */
  otherId: z.string().nullable(),
  /** Every model year position 10 of the VIN can stand for; [] without a VIN. */
  modelYears: z.array(z.number().int()),
  meterUnit: MeterUnitSchema,
  meterReading: z.number().nullable(),
  meterReadAt: z.string().nullable(),
  /** As entered from the service manual; null = the generic default (see `specs`). */
  fuelPressureMinKpa: z.number().nullable(),
  fuelPressureMaxKpa: z.number().nullable(),
  holdMaxDropKpa: z.number().nullable(),
  holdMinutes: z.number().nullable(),
  flowMinLph: z.number().nullable(),
  /** The limits a check will judge against, each labelled manual or generic. */
  specs: z.object({
    fuelPressureMinKpa: MachineSpecValueSchema,
    fuelPressureMaxKpa: MachineSpecValueSchema,
    holdMaxDropKpa: MachineSpecValueSchema,
    holdMinutes: MachineSpecValueSchema,
    flowMinLph: MachineSpecValueSchema,
  }),
  specsNote: z.string().nullable(),
  /** Staff notes; null for a customer reading their own machine. */
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Machine = z.infer<typeof MachineSchema>;

const machineFields = {
  kind: MachineKindSchema,
  year: z.number().int().min(1900).max(2100).nullish(),
  make: text(80),
  model: text(120),
  vin: VinSchema.nullish(),
  otherId: optionalText(40),
  meterUnit: MeterUnitSchema,
  meterReading: z.number().min(0).max(10_000_000).nullish(),
  fuelPressureMinKpa: specInput('fuelPressureMinKpa'),
  fuelPressureMaxKpa: specInput('fuelPressureMaxKpa'),
  holdMaxDropKpa: specInput('holdMaxDropKpa'),
  holdMinutes: specInput('holdMinutes'),
  flowMinLph: specInput('flowMinLph'),
  specsNote: optionalText(500),
  notes: optionalText(2000),
};

export const CreateMachineInputSchema = z.strictObject({
  customerId: z.number().int().positive().max(2_147_483_647),
  ...machineFields,
});
/** What the server works with after parsing (specs converted to canonical numbers). */
export type CreateMachineInput = z.infer<typeof CreateMachineInputSchema>;
/** What a client may send (specs as numbers or typed text). */
export type CreateMachineBody = z.input<typeof CreateMachineInputSchema>;

/** A machine stays with its customer: a sold machine is archived and booked again for the new owner. */
export const UpdateMachineInputSchema = z.strictObject(machineFields).partial();
export type UpdateMachineInput = z.infer<typeof UpdateMachineInputSchema>;
export type UpdateMachineBody = z.input<typeof UpdateMachineInputSchema>;

export const MachineListQuerySchema = ListQuerySchema.extend({
  customerId: IdSchema.optional(),
  /** Matches make, model, VIN or other id, any part, any case. */
  q: z.string().trim().max(120).optional(),
  /** `true` lists archived machines too, as the customers list does. */
  archived: z.enum(['true', 'false']).optional(),
});
export type MachineListQuery = z.infer<typeof MachineListQuerySchema>;

export const MachineListSchema = listResponseSchema(MachineSchema);

/** A guided check as the machine's history shows it. */
export const MachineHistoryCheckSchema = z.object({
  id: z.number().int(),
  procedureKey: z.string(),
  status: CheckRunStatusSchema,
  verdict: VerdictSchema.nullable(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
});

export const MachineHistoryJobSchema = z.object({
  id: z.number().int(),
  status: JobStatusSchema,
  complaint: z.string(),
  diagnosis: z.string().nullable(),
  workDone: z.string().nullable(),
  scheduledAt: z.string().nullable(),
  completedAt: z.string().nullable(),
  /** The meter at this visit, in the machine's `meterUnit`. */
  meterReading: z.number().nullable(),
  checks: z.array(MachineHistoryCheckSchema),
});
export type MachineHistoryJob = z.infer<typeof MachineHistoryJobSchema>;

/** Every job on the machine, newest first, each with its checks in the order they were started. */
export const MachineHistorySchema = z.object({
  machineId: z.number().int(),
  meterUnit: MeterUnitSchema,
  jobs: z.array(MachineHistoryJobSchema),
});
export type MachineHistory = z.infer<typeof MachineHistorySchema>;
