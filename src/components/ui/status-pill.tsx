import { toneClasses, toneGlyphs } from './tone';
import type { Tone } from './tone';

type StatusPillProps = { tone: Tone; children: string };

export function StatusPill({ tone, children }: StatusPillProps) {
  return (
    <span
      className={`inline-flex items-center gap-2 rounded-plate border-2 px-3 py-1 text-sm font-bold ${toneClasses[tone]}`}
    >
      <span aria-hidden="true">{toneGlyphs[tone]}</span>
      {children}
    </span>
  );
}
