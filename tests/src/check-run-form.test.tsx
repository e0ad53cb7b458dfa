// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { unit } from 'mathjs';
import { afterEach, describe, expect, it } from 'vitest';
import { DEFER_LINE } from '../../shared/procedures/cautions';
import { batteryCharging } from '../../shared/procedures/battery-charging';
import { fuelDelivery } from '../../shared/procedures/fuel-delivery';
import { checkRunRoutes, fakeRun, jobWithMachine, presentRun } from './check-fake-api';
import { fakeApi, requestedPaths, session } from './fake-api';
import { currentPath, jsonResponse, renderApp } from './render-app';

afterEach(cleanup);

// Looked up afresh each time: the frame's <main> replaces the sign-in check's once the session is known.
const main = () => within(screen.getByRole('main'));
const ACK = 'I have read this caution and it is safe to go on';

/** The fuel check answered up to the step before `until`, every answer a passing one. */
const FUEL_ANSWERS = [
  { stepKey: 'symptoms', answer: { symptoms: [] } },
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
          { sec: 30, value: 42.5 },
          { sec: 300, value: 42 },
        ],
      },
    },
  },
  { stepKey: 'engine-runs', answer: { runs: 'yes' } },
];
/** The answers before `stepKey`; all of them for the step after the last one listed. */
const answersBefore = (stepKey: string) => {
  const at = FUEL_ANSWERS.findIndex((a) => a.stepKey === stepKey);
  return at === -1 ? FUEL_ANSWERS : FUEL_ANSWERS.slice(0, at);
};
/** Disabled by its own attribute or by the fieldset around it, as the browser decides. */
const isDisabled = (element: HTMLElement) => element.matches(':disabled');

describe('a guided check walked in the browser', () => {
  it('keeps a hazardous step’s readings locked until its caution is acknowledged', async () => {
    const run = fakeRun(fuelDelivery, { answers: answersBefore('basics-battery') });
    fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    const heading = await screen.findByRole('heading', { level: 2, name: 'Battery at rest' });
    const caution = main().getByRole('region', { name: 'Caution: Battery terminals' });
    const volts = main().getByLabelText('Resting voltage');
    // The caution stands before the step's inputs, and ends by deferring to the manual.
    expect(caution.compareDocumentPosition(volts) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    const lines = within(caution)
      .getAllByRole('listitem')
      .map((li) => li.textContent);
    expect(lines.at(-1)).toBe(DEFER_LINE);
    expect(isDisabled(volts)).toBe(true);
    expect(isDisabled(main().getByLabelText('Flooded lead-acid'))).toBe(true);
    expect(isDisabled(main().getByRole('button', { name: 'Save step' }))).toBe(true);
    // Going back and pausing need no acknowledgement.
    expect(isDisabled(main().getByRole('button', { name: 'Pause, finish later' }))).toBe(false);
    expect(document.activeElement).toBe(heading);

    fireEvent.click(main().getByLabelText(ACK));
    expect(isDisabled(volts)).toBe(false);
    expect(isDisabled(main().getByRole('button', { name: 'Save step' }))).toBe(false);
  });

  it('judges a typed 43psi at once, by the machine’s own limits', async () => {
    // A manual band of 45–50 psi, stored in kPa as the machines table keeps it (mathjs converts).
    const spec = {
      fuelPressureMinKpa: unit(45, 'psi').toNumber('kPa'),
      fuelPressureMaxKpa: unit(50, 'psi').toNumber('kPa'),
    };
    const run = fakeRun(fuelDelivery, { answers: answersBefore('running-pressure'), spec });
    fakeApi({ ...session('owner'), ...jobWithMachine(7, spec), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { level: 2, name: 'Running pressure' });
    fireEvent.click(main().getByLabelText(ACK));
    fireEvent.change(main().getByLabelText('At idle'), { target: { value: '43psi' } });
    expect(main().getByText('Read as').parentElement?.textContent).toBe('Read as 43 psi');
    expect(main().getByText(/Still to give: On a throttle snap \(lowest\), At held throttle/)).toBeTruthy();

    fireEvent.change(main().getByLabelText('On a throttle snap (lowest)'), { target: { value: '47 psi' } });
    fireEvent.change(main().getByLabelText('At held throttle'), { target: { value: '3.3bar' } });
    // 43 psi is under the manual's 45 psi floor: the running pressure dips, the engine runs lean.
    const live = await main().findByTestId('live-verdict');
    await waitFor(() => expect(within(live).getByText('Fail')).toBeTruthy());
    expect(live.textContent).toMatch(/idle/);
    // The other two are inside the band: 3.3 bar is 47.86 psi (mathjs), within 45–50.

    fireEvent.change(main().getByLabelText('At idle'), { target: { value: '46psi' } });
    await waitFor(() => expect(within(main().getByTestId('live-verdict')).getByText('Pass')).toBeTruthy());
  });

  it('says what cannot be read as it is typed, and refuses to save it', async () => {
    const run = fakeRun(fuelDelivery, { answers: answersBefore('basics-battery') });
    const fetchMock = fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { level: 2, name: 'Battery at rest' });
    fireEvent.click(main().getByLabelText(ACK));
    fireEvent.click(main().getByLabelText('AGM'));
    const volts = main().getByLabelText('Resting voltage');
    fireEvent.change(volts, { target: { value: '12.6psi' } });
    expect(volts.getAttribute('aria-invalid')).toBe('true');
    expect(main().getAllByText(/is pressure, expected voltage/).length).toBeGreaterThan(0);
    fireEvent.submit(volts.closest('form')!);
    expect(requestedPaths(fetchMock).filter((p) => p.endsWith('/steps'))).toEqual([]);
  });

  it('saves a step and shows the server’s verdict as the record', async () => {
    const run = fakeRun(fuelDelivery, { answers: answersBefore('basics-battery') });
    const fetchMock = fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { level: 2, name: 'Battery at rest' });
    fireEvent.click(main().getByLabelText(ACK));
    fireEvent.click(main().getByLabelText('Flooded lead-acid'));
    fireEvent.change(main().getByLabelText('Resting voltage'), { target: { value: '12.6' } });
    fireEvent.submit(main().getByLabelText('Resting voltage').closest('form')!);

    const next = await screen.findByRole('heading', { level: 2, name: 'Fuel condition' });
    await waitFor(() => expect(document.activeElement).toBe(next));
    const [, init] = fetchMock.mock.calls.find(([input]) => String(input).endsWith('/steps'))!;
    expect(JSON.parse(String(init?.body))).toEqual({
      stepKey: 'basics-battery',
      answer: { batteryType: 'flooded', volts: { value: 12.6, unit: 'V' } },
      cautionAcknowledged: true,
    });
    const saved = main().getByRole('status');
    expect(saved.textContent).toMatch(/Saved step 2, Battery at rest/);
    expect(within(saved).getByText('Pass')).toBeTruthy();
  });

  it('judges a run by the limits it started with, as the server does, not the machine’s today', async () => {
    // The run started under a 45–50 psi manual band; the machine's record has since lost it (its
    // generic band would be 39–47 psi, common practice). 43 psi is under the band the run keeps.
    const started = {
      fuelPressureMinKpa: unit(45, 'psi').toNumber('kPa'),
      fuelPressureMaxKpa: unit(50, 'psi').toNumber('kPa'),
    };
    const run = fakeRun(fuelDelivery, { answers: answersBefore('running-pressure'), spec: started });
    fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { level: 2, name: 'Running pressure' });
    fireEvent.click(main().getByLabelText(ACK));
    for (const label of ['At idle', 'On a throttle snap (lowest)', 'At held throttle'])
      fireEvent.change(main().getByLabelText(label), { target: { value: '43psi' } });
    await waitFor(() => expect(within(main().getByTestId('live-verdict')).getByText('Fail')).toBeTruthy());
    fireEvent.click(main().getByRole('button', { name: 'Save step' }));

    const saved = await main().findByText(/Saved step 10, Running pressure/);
    const note = saved.closest('[role="status"]')!;
    expect(within(note as HTMLElement).getByText('Fail')).toBeTruthy();
    expect(note.textContent).not.toMatch(/differs from the verdict judged here/);
  });

  it('goes back a step with the answer given, asking for the caution again', async () => {
    const run = fakeRun(fuelDelivery, { answers: answersBefore('basics-fuel') });
    const fetchMock = fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { level: 2, name: 'Fuel condition' });
    fireEvent.click(main().getByRole('button', { name: 'Back a step' }));

    const heading = await screen.findByRole('heading', { level: 2, name: 'Battery at rest' });
    await waitFor(() => expect(document.activeElement).toBe(heading));
    expect(requestedPaths(fetchMock)).toContain('/api/jobs/7/checks/5/back');
    expect(run.state.steps.map((s) => s.stepKey)).toEqual(['symptoms']);
    const volts = main().getByLabelText('Resting voltage') as HTMLInputElement;
    expect(volts.value).toBe('12.6 V');
    expect((main().getByLabelText('Flooded lead-acid') as HTMLInputElement).checked).toBe(true);
    expect(isDisabled(volts)).toBe(true);
    expect(main().getByText('Answered so far (1)')).toBeTruthy();
  });

  it('pauses a run and carries on with it, as one started in the van', async () => {
    const run = fakeRun(batteryCharging, { runId: 9 });
    run.status = 'paused';
    fakeApi({ ...session('helper'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/9');

    await screen.findByRole('heading', { level: 2, name: 'Battery at rest' });
    expect(main().getByText(/vanbay check resume 7 9/)).toBeTruthy();
    fireEvent.click(main().getByLabelText(ACK));
    fireEvent.click(main().getByLabelText('Flooded lead-acid'));
    fireEvent.change(main().getByLabelText('Resting voltage'), { target: { value: '12.7 V' } });
    fireEvent.click(main().getByRole('button', { name: 'Save step' }));
    // Answering a paused run carries it on: the next step, and no paused note any more.
    await screen.findByRole('heading', { level: 2, name: 'Cranking voltage' });
    expect(run.state.steps.map((s) => s.stepKey)).toEqual(['battery-rest']);
    expect(main().queryByText(/vanbay check resume/)).toBeNull();
  });

  it('starts a run from its address and moves to the run’s own, once', async () => {
    const run = fakeRun(fuelDelivery, { runId: 31 });
    const posts: unknown[] = [];
    fakeApi({
      ...session('owner'),
      ...jobWithMachine(7),
      ...checkRunRoutes(run),
      'POST /api/jobs/7/checks': ({ init }) => {
        posts.push(JSON.parse(String(init?.body)));
        return jsonResponse(201, presentRun(run));
      },
    });
    const { router } = renderApp('/jobs/7/checks/new?procedure=fuel-delivery');

    await screen.findByRole('heading', { level: 2, name: 'Symptoms' });
    expect(currentPath(router)).toBe('/jobs/7/checks/31');
    expect(posts).toHaveLength(1);
    expect(posts[0]).toMatchObject({ procedure: 'fuel-delivery' });
    // RFC 9562 layout of a version-4 UUID: the version nibble 4, the variant bits 10.
    expect((posts[0] as { clientId: string }).clientId).toMatch(
      /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/,
    );
  });

  it('shows a finished run read-only, with its findings', async () => {
    const run = fakeRun(batteryCharging, {
      answers: [
        { stepKey: 'battery-rest', answer: { batteryType: 'flooded', volts: { value: 11.9, unit: 'V' } } },
      ],
    });
    fakeApi({ ...session('owner'), ...jobWithMachine(7), ...checkRunRoutes(run) });
    renderApp('/jobs/7/checks/5');

    await screen.findByRole('heading', { name: 'Findings' });
    expect(main().queryByRole('button', { name: 'Save step' })).toBeNull();
    expect(main().getByText('Each step (1)')).toBeTruthy();
    expect(main().getAllByText('Fail').length).toBeGreaterThan(0);
  });
});
