import { lazy, Suspense } from 'react';
import type { Figure } from '../../../../shared/evaluators/types';
import type { SeriesValue } from '../../../../shared/procedures/types';
import { UNITS } from '../../../../shared/units';
import { formatDecimal } from '../../../lib/format';
import { holdChartModel, type HoldChartModel } from '../hold-chart-model';
import { valueWithUnit } from '../walk';
import { clockTime } from './hold-text';

const HoldChart = lazy(() => import('./hold-chart').then((module) => ({ default: module.HoldChart })));

/** The label every generic limit carries wherever it is shown (DEVELOPERS.md, "Data rules"). */
export const GENERIC_LABEL = 'generic — confirm in the service manual';

/**
 * A static hold as a picture and in words: pressure over time against the lowest pressure the
 * allowed drop permits. The chart is for the eye; the sentence and the table say the same.
 */
export function PressureHold({
  series,
  figures,
  title = 'Pressure over time',
}: {
  series: SeriesValue;
  figures: Record<string, Figure>;
  title?: string;
}) {
  const model = holdChartModel(series, figures);
  if (!model) return null;
  return (
    <figure className="mt-3 grid gap-2">
      <figcaption className="text-base font-bold">
        {title}, in {UNITS[model.unit].label}
      </figcaption>
      <div className="h-[280px]" aria-hidden="true" data-testid="hold-chart">
        <Suspense fallback={<p className="text-lg text-ink-soft">Drawing the chart…</p>}>
          <HoldChart model={model} />
        </Suspense>
      </div>
      <HoldSummary model={model} />
      <details className="text-base">
        <summary className="flex min-h-touch cursor-pointer items-center font-bold">
          The readings as a table
        </summary>
        <table className="mt-1 w-full max-w-sm border-collapse text-left">
          <caption className="sr-only">{title}</caption>
          <thead>
            <tr className="border-b-2 border-ink">
              <th scope="col" className="py-1 pr-4">
                After the pump stopped
              </th>
              <th scope="col" className="py-1 text-right">
                Pressure
              </th>
            </tr>
          </thead>
          <tbody>
            {model.points.map((point) => (
              <tr key={point.sec} className="border-b border-rule">
                <th scope="row" className="py-1 pr-4 font-medium">
                  {clockTime(point.sec)}
                </th>
                <td className="py-1 text-right font-bold tabular-nums">
                  {valueWithUnit(point.value, model.unit)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}

/** The chart's limit in words: the reference after settling, the drop allowed, the line it draws. */
export function HoldSummary({ model }: { model: HoldChartModel }) {
  const unit = UNITS[model.unit].label;
  const drop = `${formatDecimal(model.allowedDrop, 2)} ${unit}`;
  const source = model.specSource === 'generic' ? ` (${GENERIC_LABEL})` : ' (from the service manual)';
  if (!model.reference || model.limit === null) {
    return (
      <p className="text-base" data-testid="hold-summary">
        No reading between the {model.settleSec} s settling window and the end of the hold at{' '}
        {clockTime(model.endSec)}, so there is no reference to measure the drop from. Allowed drop {drop}
        {source}.
      </p>
    );
  }
  return (
    <p className="text-base" data-testid="hold-summary">
      Reference {valueWithUnit(model.reference.value, model.unit)} at {clockTime(model.reference.sec)}, the
      first reading after the {model.settleSec} s settling window. Allowed drop {drop}
      {source}, so the limit line is at{' '}
      <strong className="font-bold">
        {formatDecimal(model.limit, 2)} {unit}
      </strong>
      {model.lowest ? (
        <>
          ; lowest {valueWithUnit(model.lowest.value, model.unit)} at {clockTime(model.lowest.sec)}.
        </>
      ) : (
        '.'
      )}
    </p>
  );
}
