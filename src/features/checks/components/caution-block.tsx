import { useId } from 'react';
import { toneClasses, toneGlyphs } from '../../../components/ui/tone';

type CautionBlockProps = {
  caution: { title: string; lines: readonly string[] };
  acknowledged: boolean;
  onAcknowledge: (acknowledged: boolean) => void;
};

/**
 * The safety caution of a hazardous step, shown before its readings and acknowledged before they
 * unlock (PRODUCT.md, "Safety"). Its last line defers to the service manual, local codes and
 * licensed practice, as every caution's does.
 */
export function CautionBlock({ caution, acknowledged, onAcknowledge }: CautionBlockProps) {
  const id = useId();
  return (
    <section aria-labelledby={id} className={`rounded-plate border-3 p-4 ${toneClasses.warn}`}>
      <h3 id={id} className="flex items-center gap-2 text-xl font-bold">
        <span aria-hidden="true">{toneGlyphs.warn}</span>
        Caution: {caution.title}
      </h3>
      <ul className="mt-2 grid list-disc gap-1 pl-6 text-lg text-ink">
        {caution.lines.map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
      <label className="mt-3 flex min-h-touch cursor-pointer items-center gap-3 rounded-plate border-2 border-ink bg-panel px-4 py-2 text-lg font-bold text-ink">
        <input
          type="checkbox"
          checked={acknowledged}
          onChange={(event) => onAcknowledge(event.target.checked)}
          className="h-7 w-7 shrink-0 accent-coolant"
        />
        I have read this caution and it is safe to go on
      </label>
    </section>
  );
}
