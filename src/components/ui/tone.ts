/** The verdict scale every status in Vanbay maps onto, plus "quiet" for no verdict yet. */
export type Tone = 'pass' | 'warn' | 'fail' | 'quiet';

// Written out in full so Tailwind's scanner finds every class.
export const toneClasses: Record<Tone, string> = {
  pass: 'border-pass bg-pass-wash text-pass',
  warn: 'border-warn bg-warn-wash text-warn',
  fail: 'border-fail bg-fail-wash text-fail',
  quiet: 'border-rule bg-panel text-ink-soft',
};

/** A shape per tone, so the status reads without colour (colour-blind eyes, a washed-out screen). */
export const toneGlyphs: Record<Tone, string> = {
  pass: '●',
  warn: '▲',
  fail: '✕',
  quiet: '○',
};
