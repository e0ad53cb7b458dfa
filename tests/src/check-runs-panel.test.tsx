// @vitest-environment jsdom
import { QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, within } from '@testing-library/react';
import { unit } from 'mathjs';
import { MemoryRouter } from 'react-router';
import { afterEach, describe, expect, it } from 'vitest';
import { CheckRunSummarySchema } from '../../shared/api/checks';
import type { Role } from '../../shared/api/users';
import { batteryCharging } from '../../shared/procedures/battery-charging';
import { fuelDelivery } from '../../shared/procedures/fuel-delivery';
import { createQueryClient } from '../../src/app/query-client';
import { CheckRunsPanel } from '../../src/features/checks/components/check-runs-panel';
import { sessionQueries } from '../../src/features/session/api/queries';
import { checkRunRoutes, fakeRun, presentRun, type FakeRun } from './check-fake-api';
import { demoUsers, fakeApi } from './fake-api';
import { jsonResponse } from './render-app';

afterEach(cleanup);

/** A machine whose manual allows a 2 psi drop over 5 min and a 40–46 psi band (kPa by mathjs). */
const SPEC = {
  fuelPressureMinKpa: unit(40, 'psi').toNumber('kPa'),
  fuelPressureMaxKpa: unit(46, 'psi').toNumber('kPa'),
  holdMaxDropKpa: unit(2, 'psi').toNumber('kPa'),
  holdMinutes: 5,
};

function finishedFuelRun(): FakeRun {
  return fakeRun(fuelDelivery, {
    runId: 12,
    spec: SPEC,
    answers: [
      { stepKey: 'symptoms', answer: { symptoms: ['long_cranking'] } },
      { stepKey: 'basics-battery', answer: { batteryType: 'flooded', volts: { value: 12.6, unit: 'V' } } },
      { stepKey: 'basics-fuel', answer: { fuel: 'fresh' } },
      { stepKey: 'basics-air-filter', answer: { airFilter: 'clean' } },
      { stepKey: 'basics-fault-codes', answer: { faultCodes: 'none' } },
      { stepKey: 'basics-engine', answer: { engine: 'confirmed' } },
      { stepKey: 'prime-run', answer: { primeRun: 'ran_stopped', seconds: { value: 2.5, unit: 's' } } },
      {
        stepKey: 'static-pressure-hold',
        answer: {
          points: {
            unit: 'psi',
            points: [
              { sec: 0, value: 43 },
              { sec: 30, value: 42 },
              { sec: 120, value: 40.5 },
              { sec: 300, value: 38.6 },
            ],
          },
        },
      },
      { stepKey: 'engine-runs', answer: { runs: 'yes' } },
      {
        stepKey: 'running-pressure',
        answer: {
          idle: { value: 43, unit: 'psi' },
          snap: { value: 42, unit: 'psi' },
          held: { value: 43, unit: 'psi' },
        },
      },
      { stepKey: 'filters', answer: { filters: 'ok' } },
    ],
  });
}

function renderPanel(role: Role, runs: FakeRun[]) {
  const routes = Object.assign(
    {
      'GET /api/jobs/7/checks': () =>
        jsonResponse(200, {
          items: runs.map((run) => CheckRunSummarySchema.parse(presentRun(run))),
          nextCursor: null,
        }),
    },
    ...runs.map(checkRunRoutes),
  );
  fakeApi(routes);
  const queryClient = createQueryClient({ retry: false });
  // The frame knows who is signed in before any page inside it renders.
  queryClient.setQueryData(sessionQueries.me().queryKey, demoUsers[role]);
  return render(
    <QueryClientProvider client={queryClient}>
      <MemoryRouter initialEntries={['/jobs/7']}>
        <CheckRunsPanel jobId={7} />
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

describe('the checks panel of a job', () => {
  it('offers the workshop every check to start', async () => {
    renderPanel('helper', []);
    await screen.findByText(/No guided check on this job yet/);
    const starts = screen.getAllByRole('link', { name: /^Start / });
    expect(starts.map((a) => a.getAttribute('href'))).toEqual([
      '/jobs/7/checks/new?procedure=fuel-delivery',
      '/jobs/7/checks/new?procedure=battery-charging',
      '/jobs/7/checks/new?procedure=compression',
    ]);
  });

  it('shows each step’s verdict and reason, the findings, and the hold against its limit', async () => {
    const fuel = finishedFuelRun();
    const paused = fakeRun(batteryCharging, { runId: 9 });
    paused.status = 'paused';
    renderPanel('owner', [fuel, paused]);

    const card = (await screen.findByRole('link', { name: 'Fuel delivery check, check 12' })).closest(
      'article',
    )!;
    const hold = await within(card).findByRole('heading', { name: '8. Static pressure hold' });
    const step = hold.closest('article')!;
    // Fell 42 → 38.6 psi after settling, 3.4 psi against the manual's 2: a failed hold.
    expect(within(step).getByText('Fail')).toBeTruthy();
    expect(step.textContent).toMatch(/Fell 3\.4 psi/);
    // The limit line: 42 psi at 30 s (the first reading at or after 30 s, CONTRACT.md) less 2 psi.
    expect(within(step).getByTestId('hold-summary').textContent).toMatch(
      /limit line is at 40 psi.*lowest 38\.6 psi at 5:00/,
    );
    expect(within(step).getByTestId('hold-summary').textContent).toMatch(/from the service manual/);
    expect(within(card).getByRole('heading', { name: 'Pressure does not hold' })).toBeTruthy();
    expect(within(card).getByText(/11 steps: /)).toBeTruthy();

    const continueLink = screen.getByRole('link', { name: /^Continue check 9/ });
    expect(continueLink.getAttribute('href')).toBe('/jobs/7/checks/9');
    expect(continueLink.textContent).toBe('Continue check 9 at step 1');
  });

  it('lets a customer read the checks but neither start nor carry one on', async () => {
    const paused = fakeRun(batteryCharging, { runId: 9 });
    paused.status = 'paused';
    renderPanel('customer', [finishedFuelRun(), paused]);

    await screen.findByRole('heading', { name: '8. Static pressure hold' });
    expect(screen.queryAllByRole('link', { name: /^Start / })).toEqual([]);
    expect(screen.queryByRole('link', { name: /^Continue/ })).toBeNull();
  });
});
