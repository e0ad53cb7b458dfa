import type { ReactNode } from 'react';
import { toneClasses, toneGlyphs } from './tone';

type AlertPanelProps = { title: string; children: ReactNode };

/** Something failed: announced at once (role="alert"), marked with the fail glyph as well as its colour. */
export function AlertPanel({ title, children }: AlertPanelProps) {
  return (
    <section role="alert" className={`rounded-plate border-3 p-5 ${toneClasses.fail}`}>
      <h2 className="flex items-center gap-2 text-xl font-bold">
        <span aria-hidden="true">{toneGlyphs.fail}</span>
        {title}
      </h2>
      <div className="mt-2 max-w-prose text-lg text-ink">{children}</div>
    </section>
  );
}
