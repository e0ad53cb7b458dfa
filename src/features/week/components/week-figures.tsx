import type { WeekReport } from '../../../../shared/api/reports';
import { countOf, formatDecimal } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { FigureTile } from './figure-tile';

/** The week's figures, each with what it counts (the definitions are WeekReportSchema's). */
export function WeekFigures({ report }: { report: WeekReport }) {
  return (
    <section aria-labelledby="week-figures">
      <h2 id="week-figures" className="sr-only">
        Figures for the week
      </h2>
      <dl className="grid grid-cols-1 gap-3 sm:grid-cols-2 xl:grid-cols-4">
        <FigureTile label="Jobs done" value={formatDecimal(report.jobsDone, 0)} note="completed this week" />
        <FigureTile
          label="Hours billed"
          value={`${formatDecimal(report.hoursBilled, 2)} h`}
          note="labour on invoices issued"
        />
        <FigureTile
          label="Revenue"
          value={formatCents(report.revenueCents)}
          note="invoices issued, tax included"
        />
        <FigureTile
          label="Collected"
          value={formatCents(report.collectedCents)}
          note="payments received, refunds netted"
        />
        <FigureTile
          label="Unpaid"
          value={formatCents(report.unpaid.balanceCents)}
          note={`${countOf(report.unpaid.count, 'invoice')} open at the week’s end`}
        />
        <FigureTile
          label="Overdue"
          value={formatCents(report.overdue.balanceCents)}
          note={`${countOf(report.overdue.count, 'invoice')} past the due date`}
          alarm={report.overdue.count > 0}
        />
        {/* One decimal, as an odometer reads; the report keeps thousandths for the sums. */}
        <FigureTile label="Miles" value={`${formatDecimal(report.miles, 1)} mi`} note="finished van trips" />
        <FigureTile
          label="Deduction"
          value={report.deductionCents === null ? 'Not known' : formatCents(report.deductionCents)}
          note={
            report.deductionCents === null
              ? 'a trip falls on a day with no IRS rate on file'
              : 'those miles at the IRS standard rate'
          }
        />
      </dl>
    </section>
  );
}

/** A week with nothing in it: no work, no money in or billed, no driving, no checks. */
export function isQuietWeek(report: WeekReport): boolean {
  const checks = report.checks.pass + report.checks.warn + report.checks.fail;
  return (
    report.jobsDone === 0 &&
    report.hoursBilled === 0 &&
    report.revenueCents === 0 &&
    report.collectedCents === 0 &&
    report.miles === 0 &&
    checks === 0
  );
}
