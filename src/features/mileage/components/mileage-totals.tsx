import type { MileageTotals, TripSummary } from '../../../../shared/api/trips';
import { ratesInYear } from '../../../../shared/mileage';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { Panel } from '../../../components/ui/panel';
import { toneClasses } from '../../../components/ui/tone';
import { calendarDate, formatDecimal } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { useMileageSummary } from '../api/queries';

const monthName = new Intl.DateTimeFormat('en-US', { month: 'long' });

/** Miles to a tenth, as an odometer reads; the API keeps thousandths and the CSV has them. */
export const milesText = (miles: number) => `${formatDecimal(miles, 1)} mi`;

export function deductionText(cents: number | null): string {
  return cents === null ? 'Not known' : formatCents(cents);
}

/** The tax year's figures, then month by month, each as the trips summary states them. */
export function MileageTotalsPanel({ year }: { year: number }) {
  const summary = useMileageSummary(year);
  if (summary.isPending) return <Loading>Loading the year’s totals…</Loading>;
  if (summary.isError) {
    return (
      <LoadFailure
        title="The mileage totals could not be loaded"
        error={summary.error}
        onRetry={() => void summary.refetch()}
        retrying={summary.isFetching}
      />
    );
  }
  return (
    <div className="grid gap-6">
      <YearFigures summary={summary.data} />
      <MonthTable summary={summary.data} />
    </div>
  );
}

function YearFigures({ summary }: { summary: TripSummary }) {
  const { total } = summary;
  const rates = ratesInYear(summary.year);
  return (
    <section aria-labelledby="year-figures">
      <h2 id="year-figures" className="mb-3 text-xl font-bold">
        Tax year {summary.year}
      </h2>
      <dl className="grid grid-cols-1 gap-3 sm:grid-cols-3">
        <Tile
          label="Trips"
          value={formatDecimal(total.trips, 0)}
          note="finished, with both odometer readings"
        />
        <Tile label="Miles" value={milesText(total.miles)} note="business miles driven" />
        <Tile
          label="Deduction"
          value={deductionText(total.deductionCents)}
          note={
            total.deductionCents === null
              ? 'a trip falls on a day with no IRS rate on file'
              : rates.length === 0
                ? 'at the IRS standard rate'
                : `at the IRS standard rate (${rates.map((r) => `${formatDecimal(r.tenthsOfCentPerMile / 10, 1)}¢/mi`).join(', then ')})`
          }
          alarm={total.deductionCents === null}
        />
      </dl>
    </section>
  );
}

function Tile({
  label,
  value,
  note,
  alarm = false,
}: {
  label: string;
  value: string;
  note: string;
  alarm?: boolean;
}) {
  return (
    <div
      className={`rounded-plate border-2 p-4 ${alarm ? toneClasses.warn : 'border-rule bg-panel text-ink'}`}
    >
      <dt className="text-sm font-bold tracking-wider uppercase">{label}</dt>
      <dd className="mt-1 text-3xl font-bold tabular-nums">{value}</dd>
      <dd className={`mt-1 text-base font-medium ${alarm ? '' : 'text-ink-soft'}`}>{note}</dd>
    </div>
  );
}

/** Twelve months and the year; the year's deduction is its own figure, not the sum of the rounded months. */
function MonthTable({ summary }: { summary: TripSummary }) {
  const cell = 'px-4 py-2';
  return (
    <Panel className="overflow-x-auto p-0">
      <table className="w-full border-collapse text-base">
        <caption className="px-4 pt-3 text-left text-lg font-bold">Month by month, {summary.year}</caption>
        <thead>
          <tr className="border-b-2 border-ink">
            <th scope="col" className={`${cell} text-left`}>
              Month
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Trips
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Miles
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Deduction
            </th>
          </tr>
        </thead>
        <tbody className="tabular-nums">
          {summary.months.map((month) => (
            <MonthRow
              key={month.month}
              label={monthName.format(calendarDate(`${month.month}-01`))}
              totals={month}
            />
          ))}
        </tbody>
        <tfoot className="tabular-nums">
          <MonthRow label={`Tax year ${summary.year}`} totals={summary.total} strong />
        </tfoot>
      </table>
      <p className="px-4 pb-3 text-base text-ink-soft">
        Each deduction is the miles times the IRS rate in force, rounded to the cent once per rate period, so
        the year’s figure can differ from the months added up by a cent or two.
      </p>
    </Panel>
  );
}

function MonthRow({
  label,
  totals,
  strong = false,
}: {
  label: string;
  totals: MileageTotals;
  strong?: boolean;
}) {
  const quiet = totals.trips === 0 && !strong;
  const cell = 'px-4 py-2';
  return (
    <tr
      className={
        strong
          ? 'border-t-2 border-ink text-lg font-bold'
          : `border-b border-rule ${quiet ? 'text-ink-soft' : ''}`
      }
    >
      <th scope="row" className={`${cell} text-left ${strong ? 'font-bold' : 'font-medium'}`}>
        {label}
      </th>
      <td className={`${cell} text-right`}>{formatDecimal(totals.trips, 0)}</td>
      <td className={`${cell} text-right`}>{milesText(totals.miles)}</td>
      <td className={`${cell} text-right`}>{deductionText(totals.deductionCents)}</td>
    </tr>
  );
}
