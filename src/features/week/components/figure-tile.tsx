import { toneClasses, toneGlyphs } from '../../../components/ui/tone';

type FigureTileProps = {
  label: string;
  value: string;
  /** What the figure counts, in a few words, so nobody has to guess what "Revenue" includes. */
  note: string;
  /** Marks a figure that needs acting on (overdue money) with the fail glyph and colour. */
  alarm?: boolean;
};

/** One term and its figure in the week's list of figures (a <dl>). */
export function FigureTile({ label, value, note, alarm = false }: FigureTileProps) {
  return (
    <div
      className={`rounded-plate border-2 p-4 ${alarm ? toneClasses.fail : 'border-rule bg-panel text-ink'}`}
    >
      <dt className="text-sm font-bold tracking-wider uppercase">{label}</dt>
      <dd className="mt-1 text-3xl font-bold tabular-nums">{value}</dd>
      <dd className="mt-1 flex gap-2 text-base font-medium">
        {alarm ? <span aria-hidden="true">{toneGlyphs.fail}</span> : null}
        <span className={alarm ? '' : 'text-ink-soft'}>{note}</span>
      </dd>
    </div>
  );
}
