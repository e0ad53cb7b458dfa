import { z } from 'zod';

/**
 * A form field (always text in the browser) checked by the shared API schema of the value it
 * becomes: `read` turns the text into what the API takes, and the shared schema's own messages
 * come back on this one field, so the form and the server never disagree about what is valid.
 */
export function textField<S extends z.ZodType>(
  schema: S,
  read: (text: string) => unknown = (text) => text,
  /**
   * Said instead of zod's own words ("expected number, received string", "Invalid email address")
   * when the text is not of the right kind or shape; range and length messages stay the schema's.
   */
  wrongKind?: string,
) {
  return z.string().transform((text, ctx): z.output<S> => {
    const result = schema.safeParse(read(text));
    if (result.success) return result.data;
    const first = result.error.issues[0];
    const message =
      (first?.code === 'invalid_type' || first?.code === 'invalid_format') && wrongKind
        ? wrongKind
        : first
          ? sentence(first.message)
          : 'Not accepted.';
    ctx.addIssue({ code: 'custom', message });
    return z.NEVER;
  });
}

/** An empty or blank field means "none": null for the API. */
export const blankAsNull = (text: string): string | null => (text.trim() === '' ? null : text);

/** A whole number, or null when blank; text that is no number stays text for the schema to refuse. */
export const integerOrNull = (text: string): number | string | null => {
  const trimmed = text.trim();
  if (trimmed === '') return null;
  return /^[+-]?\d+$/.test(trimmed) ? Number(trimmed) : trimmed;
};

/** A decimal number, or null when blank; anything else stays text for the schema to refuse. */
export const decimalOrNull = (text: string): number | string | null => {
  const trimmed = text.trim().replace(/,/g, '');
  if (trimmed === '') return null;
  return /^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(trimmed) ? Number(trimmed) : trimmed;
};

/** "must be between 1 and 1000 kPa" → "Must be between 1 and 1000 kPa." */
function sentence(message: string): string {
  const capital = message.charAt(0).toUpperCase() + message.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}
