import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceArea,
  ReferenceDot,
  ReferenceLine,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { UNITS } from '../../../../shared/units';
import { formatDecimal } from '../../../lib/format';
import { holdAxis, holdTimeTicks, type HoldChartModel } from '../hold-chart-model';
import { clockTime } from './hold-text';

// The palette's own variables (tailwind.config.ts), so the chart follows daylight and night too.
const ink = 'var(--vb-ink)';
const axisTick = { fill: ink, fontSize: 15, fontWeight: 500 };
const labelStyle = { fill: ink, fontSize: 15, fontWeight: 700 };

/** Axis ticks all alike, 0:00 to 5:00, as a stopwatch reads. */
const minutesAndSeconds = (sec: number) =>
  `${Math.floor(sec / 60)}:${String(Math.round(sec % 60)).padStart(2, '0')}`;

/**
 * The pressure over time of one static hold: the one module that imports recharts for the
 * checks, loaded only when a hold is on screen.
 */
export function HoldChart({ model }: { model: HoldChartModel }) {
  const unit = UNITS[model.unit].label;
  const lastSec = model.points.at(-1)?.sec ?? 0;
  const times = holdTimeTicks(Math.max(model.endSec, lastSec));
  const axis = holdAxis(model);
  return (
    <LineChart
      data={model.points}
      responsive
      style={{ width: '100%', height: 280 }}
      margin={{ top: 8, right: 16, bottom: 8, left: 0 }}
      accessibilityLayer={false}
    >
      <CartesianGrid stroke="var(--vb-rule)" strokeOpacity={0.5} />
      <ReferenceArea
        x1={0}
        x2={model.settleSec}
        fill="var(--vb-rule)"
        fillOpacity={0.25}
        ifOverflow="extendDomain"
        label={{ value: 'Settling', position: 'insideTop', ...labelStyle }}
      />
      <XAxis
        type="number"
        dataKey="sec"
        domain={[0, times.at(-1)!]}
        ticks={times}
        interval={0}
        tickFormatter={minutesAndSeconds}
        tick={axisTick}
        stroke={ink}
      />
      <YAxis
        type="number"
        domain={axis.domain}
        ticks={axis.ticks}
        interval={0}
        allowDecimals
        tickFormatter={(value: number) => formatDecimal(value, 1)}
        tick={axisTick}
        stroke={ink}
        width={56}
      />
      {model.limit !== null ? (
        <ReferenceLine
          y={model.limit}
          stroke="var(--vb-fail)"
          strokeWidth={3}
          strokeDasharray="8 5"
          ifOverflow="extendDomain"
          label={{
            value: `Limit ${formatDecimal(model.limit, 2)} ${unit}`,
            position: 'insideBottomRight',
            ...labelStyle,
          }}
        />
      ) : null}
      <ReferenceLine
        x={model.endSec}
        stroke={ink}
        strokeDasharray="3 4"
        ifOverflow="extendDomain"
        label={{ value: 'End', position: 'insideTopRight', ...labelStyle }}
      />
      <Tooltip
        formatter={(value) => [`${formatDecimal(Number(value), 2)} ${unit}`, 'Pressure']}
        labelFormatter={(sec) => `${clockTime(Number(sec))} after the pump stopped`}
        contentStyle={{
          background: 'var(--vb-panel)',
          border: `2px solid ${ink}`,
          borderRadius: 6,
          color: ink,
          fontWeight: 700,
        }}
      />
      <Line
        type="linear"
        dataKey="value"
        stroke="var(--vb-coolant)"
        strokeWidth={3}
        dot={{ r: 4, fill: 'var(--vb-coolant)' }}
        isAnimationActive={false}
      />
      {model.reference ? (
        <ReferenceDot
          x={model.reference.sec}
          y={model.reference.value}
          r={7}
          fill="var(--vb-panel)"
          stroke={ink}
          strokeWidth={3}
        />
      ) : null}
    </LineChart>
  );
}
