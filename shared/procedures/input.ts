/**
 * Reads a field's value from what the mechanic typed, the same way in the terminal and in a web
 * form: `43psi` or `43` (the field's default unit), a series `0:43, 30:42.5, 300:41`, a list
 * `165, 160, 120 psi`, a choice by its value or its number in the list.
 */
import { DIMENSION_OF, parseMeasurement, UnitError, type UnitId } from '../units';
import type { ChoiceOption, Field, FieldValue } from './types';

export type Parsed = { ok: true; value: FieldValue } | { ok: false; error: string };

function pickOption(options: readonly ChoiceOption[], text: string): string | null {
  const trimmed = text.trim();
  const byNumber = /^\d+$/.test(trimmed) ? options[Number(trimmed) - 1] : undefined;
  const option =
    byNumber ?? options.find((o) => o.value === trimmed || o.label.toLowerCase() === trimmed.toLowerCase());
  return option ? option.value : null;
}

/** A list of numbers that share one unit: the unit may follow any of them, or none (default). */
function sameUnitValues(
  parts: string[],
  field: Field & { quantity: keyof typeof DIMENSION_OF; defaultUnit: UnitId },
) {
  const dimension = DIMENSION_OF[field.quantity];
  const parsed = parts.map((part) => parseMeasurement(part, { dimension, defaultUnit: field.defaultUnit }));
  const typed = parts.map((part, i) =>
    /[a-z°:Ω]/i.test(part.replace(/^[\d.+-]+/, '')) ? parsed[i]!.unit : null,
  );
  const units = new Set(typed.filter((u): u is UnitId => u !== null));
  if (units.size > 1) throw new UnitError('give every value in the same unit');
  const unit = [...units][0] ?? field.defaultUnit;
  return { unit, values: parsed.map((p) => p.value) };
}

export function parseFieldInput(field: Field, text: string): Parsed {
  try {
    switch (field.type) {
      case 'measurement':
        return {
          ok: true,
          value: parseMeasurement(text, {
            dimension: DIMENSION_OF[field.quantity],
            defaultUnit: field.defaultUnit,
          }),
        };
      case 'choice': {
        const value = pickOption(field.options, text);
        return value ? { ok: true, value } : { ok: false, error: `choose 1–${field.options.length}` };
      }
      case 'choices': {
        const parts = text.split(/[\s,]+/).filter(Boolean);
        const values = parts.map((part) => pickOption(field.options, part));
        if (values.some((v) => v === null))
          return { ok: false, error: `choose from 1–${field.options.length}` };
        return { ok: true, value: [...new Set(values as string[])] };
      }
      case 'list': {
        const parts = text
          .split(/[,;]+|\s+(?=[\d.])/)
          .map((p) => p.trim())
          .filter(Boolean);
        if (parts.length === 0) return { ok: false, error: `give one value per ${field.itemLabel}` };
        return { ok: true, value: sameUnitValues(parts, field) };
      }
      case 'series': {
        const pairs = text
          .split(/[,;]+/)
          .map((p) => p.trim())
          .filter(Boolean);
        const secs: number[] = [];
        const readings: string[] = [];
        for (const pair of pairs) {
          const match = /^(\d+(?:\.\d+)?)\s*s?\s*[:=]\s*(.+)$/.exec(pair);
          if (!match) return { ok: false, error: `"${pair}" is not seconds:value, e.g. 30:42` };
          secs.push(Number(match[1]));
          readings.push(match[2]!);
        }
        const { unit, values } = sameUnitValues(readings, field);
        return { ok: true, value: { unit, points: secs.map((sec, i) => ({ sec, value: values[i]! })) } };
      }
    }
  } catch (error) {
    if (error instanceof UnitError) return { ok: false, error: error.message };
    throw error;
  }
}
