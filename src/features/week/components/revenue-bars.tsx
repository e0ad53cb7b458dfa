import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import type { WeekReport } from '../../../../shared/api/reports';
import { formatCalendarDate } from '../../../lib/format';
import { formatCents } from '../../../lib/money';

// The palette's own variables (tailwind.config.ts), so the chart follows daylight and night too.
const ink = 'var(--vb-ink)';
const axisTick = { fill: ink, fontSize: 15, fontWeight: 500 };

/**
 * The bars themselves: the one module that imports recharts, fetched on its own after the week's
 * figures, so they never wait for the chart library.
 */
export function RevenueBars({ days }: { days: WeekReport['revenueByDay'] }) {
  const data = days.map((day) => ({ ...day, day: formatCalendarDate(day.date, 'dayName') }));
  return (
    <BarChart
      data={data}
      responsive
      style={{ width: '100%', height: 260 }}
      margin={{ top: 8, right: 4, bottom: 0, left: 0 }}
      accessibilityLayer={false}
    >
      <CartesianGrid vertical={false} stroke="var(--vb-rule)" strokeOpacity={0.5} />
      {/* Every day labelled, even on a phone: a bar without its day is no use. */}
      <XAxis dataKey="day" tick={axisTick} stroke={ink} tickLine={false} interval={0} />
      <YAxis
        allowDecimals={false}
        tickFormatter={(cents: number) => formatCents(Math.round(cents), { wholeDollars: true })}
        tick={axisTick}
        stroke={ink}
        width={64}
      />
      <Tooltip
        formatter={(cents) => [formatCents(Number(cents)), 'Revenue']}
        labelFormatter={(_label, payload) => {
          const date = payload[0]?.payload?.date;
          return typeof date === 'string' ? formatCalendarDate(date, 'weekday') : '';
        }}
        cursor={{ fill: 'var(--vb-rule)', fillOpacity: 0.2 }}
        contentStyle={{
          background: 'var(--vb-panel)',
          border: `2px solid ${ink}`,
          borderRadius: 6,
          color: ink,
          fontWeight: 700,
        }}
      />
      <Bar dataKey="cents" fill="var(--vb-coolant)" radius={[4, 4, 0, 0]} isAnimationActive={false} />
    </BarChart>
  );
}
