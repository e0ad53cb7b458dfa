import { z } from 'zod';
import { UpdateBusinessInputSchema } from '../../../../shared/api/business';
import type { BusinessSettings, UpdateBusinessInput } from '../../../../shared/api/business';
import { parseScaled, scaledToText } from '../../../lib/decimal-input';
import { blankAsNull, textField } from '../../../lib/form-schema';

export type SettingKey = keyof UpdateBusinessInput;

/**
 * How a setting is typed. Money is dollars with cents (stored as cents); a markup is a percent with
 * up to two decimals (stored as basis points: 25 % = 2500); the tax rate a percent with up to four
 * (stored as parts per million: 6.25 % = 62 500), so 8.875 % is typed as it is written.
 */
export type SettingKind = 'cents' | 'bps' | 'ppm' | 'whole' | 'text' | 'optional-text' | 'lines' | 'choice';

type Codec = {
  toText: (value: unknown) => string;
  /** Text to what the API takes; text that cannot be read stays text, for the shared schema to refuse. */
  read: (text: string) => unknown;
  /** What to say when the text is not the right kind of thing at all. */
  wrongKind?: string;
};

const scaled = (places: number, trim: boolean, wrongKind: string): Codec => ({
  toText: (value) => scaledToText(value as number, places, { trim }),
  read: (text) => {
    const result = parseScaled(text, places);
    return result.ok ? result.value : text;
  },
  wrongKind,
});

export const codecs: Record<SettingKind, Codec> = {
  cents: scaled(2, false, 'Dollars and cents, e.g. 95.00.'),
  bps: scaled(2, true, 'A percent with at most two decimals, e.g. 25 or 12.5.'),
  ppm: scaled(4, true, 'A percent with at most four decimals, e.g. 6.25 or 8.875.'),
  whole: {
    toText: (value) => String(value),
    read: (text) => (/^\s*\d+\s*$/.test(text) ? Number(text) : text),
    wrongKind: 'A whole number, e.g. 14.',
  },
  text: { toText: (value) => String(value ?? ''), read: (text) => text },
  'optional-text': { toText: (value) => String(value ?? ''), read: blankAsNull },
  lines: {
    toText: (value) => (value as string[]).join('\n'),
    read: (text) =>
      text
        .split('\n')
        .map((line) => line.trim())
        .filter((line) => line !== ''),
  },
  choice: { toText: (value) => String(value), read: (text) => text },
};

export type SettingField = {
  key: SettingKey;
  label: string;
  hint?: string;
  kind: SettingKind;
  /** For `choice`: the values and their words. */
  options?: readonly { value: string; label: string }[];
  inputMode?: 'decimal' | 'numeric' | 'email' | 'tel' | 'text';
  /** Text long enough to want a box of its own (a closing line). */
  long?: boolean;
};

const shape = UpdateBusinessInputSchema.shape;

/** The form schema of a section: each field read by its codec, then checked by the shared schema's own rule. */
export function sectionSchema(fields: readonly SettingField[]) {
  return z.object(
    Object.fromEntries(
      fields.map((field) => {
        const codec = codecs[field.kind];
        return [field.key, textField(shape[field.key], codec.read, codec.wrongKind)];
      }),
    ),
  );
}

/** A section's fields as the form shows them, from the settings as they stand. */
export function sectionTexts(
  fields: readonly SettingField[],
  settings: BusinessSettings,
): Record<string, string> {
  return Object.fromEntries(
    fields.map((field) => [field.key, codecs[field.kind].toText(settings[field.key])]),
  );
}
