// @vitest-environment jsdom
import { cleanup, render, screen } from '@testing-library/react';
import { unit } from 'mathjs';
import { afterEach, describe, expect, it } from 'vitest';
import { evaluatePressureHold } from '../../shared/evaluators/pressure-hold';
import { HoldSummary } from '../../src/features/checks/components/pressure-hold';
import { holdAxis, holdChartModel } from '../../src/features/checks/hold-chart-model';

afterEach(cleanup);

const psi = (points: [number, number][]) => ({
  unit: 'psi' as const,
  points: points.map(([sec, value]) => ({ sec, value })),
});
/**
 * A limit as the evaluator's figures carry it: kPa, converted here by mathjs, not by the app.
 * mathjs rounds its psi to 6894.75729 Pa where NIST SP 811 gives 6894.757293…, so psi figures
 * agree to about 1e-9 and are compared to six places.
 */
const figures = (maxDrop: number, dropUnit: string, minutes = 5, specSource = 'generic') => ({
  maxDropKpa: unit(maxDrop, dropUnit).toNumber('kPa'),
  minutes,
  specSource,
});

describe('the pressure-hold chart', () => {
  it('draws the limit at the reading at 30 s less the allowed drop, in the unit typed', () => {
    // CONTRACT.md, `calc hold`: the first point at or after 30 s is the reference. 3 psi is the
    // generic allowed drop (common practice, no published source).
    const model = holdChartModel(
      psi([
        [0, 43],
        [30, 42.5],
        [60, 42.4],
        [300, 42],
      ]),
      figures(3, 'psi'),
    )!;
    expect(model.reference).toEqual({ sec: 30, value: 42.5 });
    expect(model.allowedDrop).toBeCloseTo(3, 6);
    expect(model.limit).toBeCloseTo(39.5, 6);
    expect(model.lowest).toEqual({ sec: 300, value: 42 });
    expect(model.endSec).toBe(300);
    expect(model.settleSec).toBe(30);
  });

  it('takes the first reading after the settling window when none falls on 30 s', () => {
    const model = holdChartModel(
      psi([
        [0, 58],
        [20, 57.8],
        [45, 57.5],
        [300, 57],
      ]),
      figures(4, 'psi', 5, 'manual'),
    )!;
    expect(model.reference).toEqual({ sec: 45, value: 57.5 });
    expect(model.limit).toBeCloseTo(53.5, 6);
    expect(model.specSource).toBe('manual');
  });

  it('converts a manual limit in kPa into the bar the mechanic typed', () => {
    const model = holdChartModel(
      {
        unit: 'bar',
        points: [
          { sec: 0, value: 3 },
          { sec: 30, value: 2.95 },
          { sec: 300, value: 2.9 },
        ],
      },
      figures(20, 'kPa', 5, 'manual'),
    )!;
    // 20 kPa = 0.2 bar (mathjs); 2.95 − 0.2 = 2.75 bar.
    expect(model.allowedDrop).toBeCloseTo(unit(20, 'kPa').toNumber('bar'), 12);
    expect(model.limit).toBeCloseTo(2.75, 12);
  });

  it('draws no limit when no reading falls between settling and the end of the hold', () => {
    const model = holdChartModel(
      psi([
        [0, 43],
        [10, 42],
        [400, 41],
      ]),
      figures(3, 'psi'),
    )!;
    expect(model.reference).toBeNull();
    expect(model.limit).toBeNull();
  });

  it('agrees with the evaluator: a reading under the line is a failed hold, one above it is not', () => {
    const maxDropKpa = unit(3, 'psi').toNumber('kPa');
    for (const last of [41, 39.4]) {
      const series = psi([
        [0, 43],
        [30, 42.5],
        [300, last],
      ]);
      const evaluation = evaluatePressureHold({
        points: series.points.map((p) => ({ sec: p.sec, kpa: unit(p.value, 'psi').toNumber('kPa') })),
        maxDropKpa,
        minutes: 5,
      });
      const model = holdChartModel(series, evaluation.figures)!;
      expect(model.limit).toBeCloseTo(39.5, 6);
      expect(evaluation.verdict).toBe(last < model.limit! ? 'fail' : 'pass');
    }
  });

  it('keeps every reading and the limit on the pressure axis, on even ticks', () => {
    const model = holdChartModel(
      psi([
        [0, 43.5],
        [30, 43.05],
        [300, 42.8],
      ]),
      figures(3, 'psi'),
    )!;
    const { domain, ticks } = holdAxis(model);
    expect(domain[0]).toBeLessThanOrEqual(model.limit!);
    expect(domain[1]).toBeGreaterThanOrEqual(43.5);
    const steps = new Set(ticks.slice(1).map((t, i) => Math.round((t - ticks[i]!) * 1e9)));
    expect(steps.size).toBe(1);
  });

  it('says the limit in words beside the chart, labelled generic when it is', () => {
    const model = holdChartModel(
      psi([
        [0, 43],
        [30, 42.5],
        [300, 42],
      ]),
      figures(3, 'psi'),
    )!;
    render(<HoldSummary model={model} />);
    const summary = screen.getByTestId('hold-summary').textContent ?? '';
    expect(summary).toMatch(/Reference 42\.5 psi at 30 s/);
    expect(summary).toMatch(/Allowed drop 3 psi \(generic — confirm in the service manual\)/);
    expect(summary).toMatch(/limit line is at 39\.5 psi/);
  });
});
