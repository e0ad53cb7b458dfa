// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Role } from '../../shared/api/users';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import {
  jules,
  julesAsCustomer,
  job40Lines,
  job40Readings,
  KPA_PER_PSI,
  quillback,
  quillbackHistory,
  quillbackIntervals,
} from './machine-sample';
import { businessSample } from './business-sample';
import { jsonResponse, renderApp } from './render-app';

// The page's lazy module is transformed on first import, which on a busy machine can outlast
// Testing Library's wait; importing it once up front leaves each test only the page's own work.
beforeAll(async () => {
  await import('../../src/app/routes/machine');
});

afterEach(() => {
  cleanup();
  vi.useRealTimers();
});

const main = () => within(screen.getByRole('main'));

/** Machine 1's page as `role` sees it; `routes` adds or replaces answers (a PATCH, an error). */
function machineApi(role: Role, routes: Record<string, FakeRoute> = {}) {
  return fakeApi({
    ...session(role),
    'GET /api/machines/1': () => jsonResponse(200, quillback),
    'GET /api/machines/1/history': () => jsonResponse(200, quillbackHistory),
    'GET /api/machines/1/intervals': () => jsonResponse(200, quillbackIntervals),
    'GET /api/customers/1': () => jsonResponse(200, role === 'customer' ? julesAsCustomer : jules),
    'GET /api/jobs/40/readings': () => jsonResponse(200, job40Readings),
    'GET /api/jobs/40/line-items': () => jsonResponse(200, job40Lines),
    ...routes,
  });
}

async function openMachine() {
  const view = renderApp('/machines/1');
  await screen.findByRole('heading', { level: 1, name: '2019 Kestrel Quillback 650' });
  return view;
}

/** The PATCH bodies sent to machine 1, parsed. */
function patches(fetchMock: ReturnType<typeof fakeApi>): unknown[] {
  return fetchMock.mock.calls
    .filter(([input, init]) => init?.method === 'PATCH' && String(input).endsWith('/api/machines/1'))
    .map(([, init]) => JSON.parse(String(init?.body)) as unknown);
}

const specsForm = () => main().getByRole('form', { name: 'Fuel specs' });

describe('the VIN, checked as it is typed', () => {
  async function editVin() {
    machineApi('owner');
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Edit details' }));
    const form = main().getByRole('form', { name: 'Machine details' });
    return { form: within(form), vin: within(form).getByLabelText('VIN') };
  }

  it('counts, refuses I, O and Q at once, and checks the digit at 17 characters', async () => {
    const { form, vin } = await editVin();
    // The worked example of 49 CFR 565.15 as widely reproduced: 1M8GDM9AXKP042788, check digit X.
    fireEvent.change(vin, { target: { value: '1m8gdm9a' } });
    expect(form.getByText('8 of 17 characters.')).toBeTruthy();
    expect(vin.getAttribute('aria-invalid')).toBeNull();

    fireEvent.change(vin, { target: { value: '1M8GDM9AO' } });
    expect(form.getByText(/O never appears in a VIN/)).toBeTruthy();
    expect(vin.getAttribute('aria-invalid')).toBe('true');

    // One character changed from the example (position 9, X → 1): the check digit no longer matches.
    fireEvent.change(vin, { target: { value: '1M8GDM9A1KP042788' } });
    expect(form.getByText(/Check digit \(9th character\) is 1, but this VIN needs X/)).toBeTruthy();
    expect(vin.getAttribute('aria-invalid')).toBe('true');

    // Typed in lower case, read as capitals; K in position 10 is 1989 or 2019 (49 CFR 565.15 year codes).
    fireEvent.change(vin, { target: { value: '1m8gdm9axkp042788' } });
    expect(form.getByText('Check digit matches. Model year code K: 1989 or 2019.')).toBeTruthy();
    expect(vin.getAttribute('aria-invalid')).toBeNull();
  });

  it('warns when the year field disagrees with the model year code, and refuses to save it', async () => {
    const { form, vin } = await editVin();
    fireEvent.change(form.getByLabelText('Year'), { target: { value: '2018' } });
    fireEvent.change(vin, { target: { value: '1M8GDM9AXKP042788' } });
    expect(form.getByText(/model year code K stands for 1989 or 2019, not 2018/)).toBeTruthy();

    fireEvent.click(form.getByRole('button', { name: 'Save changes' }));
    expect(await form.findByText(/2018 does not match the VIN/)).toBeTruthy();
  });

  it('will not save a VIN that is still short', async () => {
    const { form, vin } = await editVin();
    fireEvent.change(vin, { target: { value: '1M8GDM9AXKP04' } });
    fireEvent.click(form.getByRole('button', { name: 'Save changes' }));
    expect(
      await form.findByText('Only 13 of 17 characters: finish the VIN, or leave it blank.'),
    ).toBeTruthy();
  });
});

describe('the fuel specs form', () => {
  it('shows each figure in use, labelling the generic ones', async () => {
    machineApi('owner');
    await openMachine();
    const form = within(specsForm());
    // 40 psi from the manual; 47 psi generic (shared/procedures/specs.ts), 47 × 6.894 757 kPa = 324.1 kPa.
    expect(form.getByLabelText('Fuel pressure, lowest')).toHaveProperty('value', '40 psi');
    expect(form.getByText(/Checks use 40 psi \(275\.8 kPa\):/).textContent).toContain(
      'from the service manual',
    );
    expect(form.getByLabelText('Fuel pressure, highest')).toHaveProperty('value', '');
    expect(form.getByText(/Checks use 47 psi \(324\.1 kPa\):/).textContent).toContain(
      'generic — confirm in the service manual',
    );
    expect(form.getAllByText('generic — confirm in the service manual')).toHaveLength(3);
  });

  it('sends only the changed specs, converted to the stored units, blank as null', async () => {
    const fetchMock = machineApi('owner', {
      'PATCH /api/machines/1': ({ init }) => {
        const body = JSON.parse(String(init?.body)) as Record<string, number | null>;
        return jsonResponse(200, { ...quillback, ...body });
      },
    });
    await openMachine();
    const form = within(specsForm());
    fireEvent.change(form.getByLabelText('Fuel pressure, lowest'), { target: { value: '41psi' } });
    fireEvent.change(form.getByLabelText('Fuel pressure, highest'), { target: { value: '3.2 bar' } });
    fireEvent.change(form.getByLabelText('Flow, least'), { target: { value: '' } });
    fireEvent.click(form.getByRole('button', { name: 'Save specs' }));

    expect(await form.findByText(/Specs saved/)).toBeTruthy();
    const [body] = patches(fetchMock) as Record<string, number | null>[];
    expect(Object.keys(body!).sort()).toEqual(['flowMinLph', 'fuelPressureMaxKpa', 'fuelPressureMinKpa']);
    // 41 psi × 6.894 757 293 168 = 282.684 049 kPa; 1 bar = 100 kPa exactly (NIST SP 811, B.8).
    expect(body!.fuelPressureMinKpa).toBeCloseTo(41 * KPA_PER_PSI, 9);
    expect(body!.fuelPressureMaxKpa).toBe(320);
    expect(body!.flowMinLph).toBeNull();
  });

  it('refuses a figure without its unit before anything is sent', async () => {
    const fetchMock = machineApi('owner');
    await openMachine();
    const form = within(specsForm());
    const field = form.getByLabelText('Hold test, most pressure lost');
    fireEvent.change(field, { target: { value: '3' } });
    fireEvent.click(form.getByRole('button', { name: 'Save specs' }));

    expect(await form.findByText('"3" needs a unit, e.g. 3 kPa.')).toBeTruthy();
    await waitFor(() => expect(field.getAttribute('aria-invalid')).toBe('true'));
    expect(patches(fetchMock)).toEqual([]);
  });

  it('shows the server’s refusal in the mechanic’s words, on the field when it names one', async () => {
    let answer = 0;
    machineApi('owner', {
      'PATCH /api/machines/1': () => {
        answer += 1;
        return answer === 1
          ? jsonResponse(400, {
              error: {
                code: 'bad_request',
                message: 'fuelPressureMinKpa is above fuelPressureMaxKpa: the band is upside down',
              },
            })
          : jsonResponse(400, {
              error: {
                code: 'validation_failed',
                message: 'Invalid body: flowMinLph: must be between 0.1 and 1000 L/h',
                details: [{ path: 'flowMinLph', message: 'must be between 0.1 and 1000 L/h' }],
              },
            });
      },
    });
    await openMachine();
    const form = within(specsForm());
    fireEvent.change(form.getByLabelText('Fuel pressure, highest'), { target: { value: '30 psi' } });
    fireEvent.click(form.getByRole('button', { name: 'Save specs' }));
    const alert = await form.findByRole('alert');
    expect(alert.textContent).toContain('The specs were not saved.');
    expect(alert.textContent).toContain('“Fuel pressure, lowest” is above “Fuel pressure, highest”');

    fireEvent.click(form.getByRole('button', { name: 'Save specs' }));
    await waitFor(() => expect(form.getByLabelText('Flow, least').getAttribute('aria-invalid')).toBe('true'));
    expect(form.getByText('must be between 0.1 and 1000 L/h')).toBeTruthy();
  });
});

describe('the service history', () => {
  it('lists each visit with its check verdict, and its readings and lines when opened', async () => {
    const fetchMock = machineApi('owner');
    await openMachine();
    const visit = within(await main().findByRole('article', { name: /Nov 13, 2026/ }));
    expect(visit.getByText('Fail')).toBeTruthy();
    expect(visit.getByRole('link', { name: 'Fuel delivery check' }).getAttribute('href')).toBe(
      '/jobs/40/checks/35',
    );
    // Nothing per job is fetched until the visit is opened.
    expect(requestedPaths(fetchMock).some((path) => path.startsWith('/api/jobs/40'))).toBe(false);

    fireEvent.click(visit.getByText('Readings and line items'));
    const readings = within(await visit.findByRole('table', { name: 'Readings on job 40' }));
    expect(readings.getByRole('rowheader', { name: /Voltage at the pump/ })).toBeTruthy();
    expect(readings.getByText('10.25 V')).toBeTruthy();
    const lines = within(await visit.findByRole('table', { name: /Line items on job 40/ }));
    expect(lines.getByText('$95.00')).toBeTruthy();
  });
});

describe('for the customer', () => {
  it('shows their machine read only: no form, no edit button, no intervals or prices asked for', async () => {
    const fetchMock = machineApi('customer');
    await openMachine();
    await main().findByRole('article', { name: /Nov 13, 2026/ });

    expect(main().queryByRole('button', { name: /edit/i })).toBeNull();
    expect(main().queryByRole('form')).toBeNull();
    expect(main().queryAllByRole('textbox')).toEqual([]);
    expect(main().queryByRole('heading', { name: 'Service intervals' })).toBeNull();
    // Every generic figure still says so (DEVELOPERS.md, "Data rules").
    expect(main().getAllByText(/generic — confirm in the service manual/)).toHaveLength(3);

    fireEvent.click(main().getByText('Readings'));
    await main().findByRole('table', { name: 'Readings on job 40' });
    const asked = requestedPaths(fetchMock);
    expect(asked.some((path) => path.startsWith('/api/machines/1/intervals'))).toBe(false);
    expect(asked.some((path) => path.startsWith('/api/jobs/40/line-items'))).toBe(false);
  });
});

describe('adding a service interval', () => {
  /** The POST bodies sent to machine 1's intervals, parsed. */
  const posted = (fetchMock: ReturnType<typeof fakeApi>) =>
    fetchMock.mock.calls
      .filter(
        ([input, init]) => init?.method === 'POST' && String(input).endsWith('/api/machines/1/intervals'),
      )
      .map(([, init]) => JSON.parse(String(init?.body)) as Record<string, unknown>);
  const intervalForm = () => within(main().getByRole('form', { name: 'New service interval' }));

  it('sends the limit on the machine’s own meter, the months, and when it was last done; the list reads again', async () => {
    let listed = 0;
    const added = {
      ...quillbackIntervals.items[0]!,
      id: 2,
      item: 'oil' as const,
      label: 'Engine oil and filter',
    };
    const fetchMock = machineApi('owner', {
      'GET /api/machines/1/intervals': () => {
        listed += 1;
        return jsonResponse(
          200,
          listed === 1
            ? quillbackIntervals
            : { ...quillbackIntervals, items: [...quillbackIntervals.items, added] },
        );
      },
      'POST /api/machines/1/intervals': () => jsonResponse(201, added),
    });
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Add an interval' }));
    const form = intervalForm();
    // Quillback's meter counts miles: the distance limit is asked for, and sent, in miles.
    fireEvent.change(form.getByLabelText('Service'), { target: { value: 'oil' } });
    fireEvent.change(form.getByLabelText('Every (mi)'), { target: { value: '4,000' } });
    fireEvent.change(form.getByLabelText('Every (months)'), { target: { value: '12' } });
    fireEvent.change(form.getByLabelText('Last done on'), { target: { value: '2026-06-01' } });
    fireEvent.change(form.getByLabelText('Last done at (mi)'), { target: { value: '15210' } });
    // Generic until the mechanic says the figures are the manual's.
    expect(form.getByLabelText('Where the interval comes from')).toHaveProperty('value', 'generic');
    fireEvent.change(form.getByLabelText('Where the interval comes from'), { target: { value: 'manual' } });
    fireEvent.click(form.getByRole('button', { name: 'Add the interval' }));

    expect(await main().findByText('Interval added.')).toBeTruthy();
    expect(posted(fetchMock)).toEqual([
      {
        item: 'oil',
        label: 'Engine oil and filter',
        everyMiles: 4000,
        everyMonths: 12,
        lastDoneOn: '2026-06-01',
        lastDoneMeter: 15210,
        source: 'manual',
      },
    ]);
    expect(await main().findByText('Engine oil and filter')).toBeTruthy();
    expect(listed).toBe(2);
  });

  it('asks for a limit before anything is sent, and keeps the form out of a bookkeeper’s reach', async () => {
    const fetchMock = machineApi('owner');
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Add an interval' }));
    const form = intervalForm();
    fireEvent.click(form.getByRole('button', { name: 'Add the interval' }));
    expect(
      await form.findByText('Give a meter limit, a months limit, or both: whichever comes first is due.'),
    ).toBeTruthy();
    fireEvent.change(form.getByLabelText('Every (months)'), { target: { value: '1.5' } });
    fireEvent.click(form.getByRole('button', { name: 'Add the interval' }));
    expect(await form.findByText('Whole months, e.g. 12.')).toBeTruthy();
    expect(posted(fetchMock)).toEqual([]);
    cleanup();

    machineApi('bookkeeper');
    await openMachine();
    expect(await main().findByRole('heading', { name: 'Service intervals' })).toBeTruthy();
    expect(main().queryByRole('button', { name: 'Add an interval' })).toBeNull();
  });
});

describe('recording a service done', () => {
  const patched = (fetchMock: ReturnType<typeof fakeApi>) =>
    fetchMock.mock.calls
      .filter(
        ([input, init]) => init?.method === 'PATCH' && String(input).endsWith('/api/machines/1/intervals/1'),
      )
      .map(([, init]) => JSON.parse(String(init?.body)) as Record<string, unknown>);

  it('sends the day and the meter (the machine’s own reading unless changed); the list reads again', async () => {
    let listed = 0;
    const done = {
      ...quillbackIntervals.items[0]!,
      lastDoneOn: '2026-11-17',
      lastDoneMeter: 18_400,
      state: {
        ...quillbackIntervals.items[0]!.state,
        status: 'ok' as const,
        verdict: 'pass' as const,
        reason: 'Not due',
      },
    };
    const fetchMock = machineApi('helper', {
      'GET /api/machines/1/intervals': () => {
        listed += 1;
        return jsonResponse(
          200,
          listed === 1 ? quillbackIntervals : { ...quillbackIntervals, items: [done] },
        );
      },
      'PATCH /api/machines/1/intervals/1': () => jsonResponse(200, done),
    });
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Record Fuel filter done' }));
    const form = within(main().getByRole('form', { name: 'Fuel filter done' }));
    // The machine's meter as last read (18 420 mi in the sample) until the mechanic says otherwise;
    // left blank, the old one (13 870 mi) would stay.
    expect(form.getByLabelText('Meter then (mi)')).toHaveProperty('value', '18420');
    expect(form.getByText('Left blank, it stays at 13,870 mi, as last recorded.')).toBeTruthy();
    fireEvent.change(form.getByLabelText('Done on'), { target: { value: '2026-11-17' } });
    fireEvent.change(form.getByLabelText('Meter then (mi)'), { target: { value: '18,400' } });
    fireEvent.click(form.getByRole('button', { name: 'Record it done' }));

    expect(await main().findByText(/^Fuel filter: recorded done on /)).toBeTruthy();
    expect(patched(fetchMock)).toEqual([{ lastDoneOn: '2026-11-17', lastDoneMeter: 18_400 }]);
    await waitFor(() => expect(listed).toBe(2));
    expect(main().queryByRole('form', { name: 'Fuel filter done' })).toBeNull();
  });

  it('offers the business’s today, not this device’s, as the day it was done', async () => {
    // 05:00 UTC on 3 December is still 2 December in Cinder Valley (America/Denver, UTC−7 in
    // winter, IANA time zone database); the device here runs on UTC.
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-12-03T05:00:00Z'));
    machineApi('owner', {
      'GET /api/business': () => jsonResponse(200, { ...businessSample, timezone: 'America/Denver' }),
    });
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Record Fuel filter done' }));
    const form = within(main().getByRole('form', { name: 'Fuel filter done' }));
    expect(form.getByLabelText('Done on')).toHaveProperty('value', '2026-12-02');
  });

  it('sends no meter when it is left blank, refuses a bad one before sending, and is not offered to a bookkeeper', async () => {
    const fetchMock = machineApi('owner', {
      'PATCH /api/machines/1/intervals/1': () => jsonResponse(200, quillbackIntervals.items[0]),
    });
    await openMachine();
    fireEvent.click(await main().findByRole('button', { name: 'Record Fuel filter done' }));
    const form = within(main().getByRole('form', { name: 'Fuel filter done' }));
    fireEvent.change(form.getByLabelText('Meter then (mi)'), { target: { value: 'lots' } });
    fireEvent.click(form.getByRole('button', { name: 'Record it done' }));
    expect(await form.findByText('A number, e.g. 18420.')).toBeTruthy();
    expect(patched(fetchMock)).toEqual([]);
    fireEvent.change(form.getByLabelText('Meter then (mi)'), { target: { value: '' } });
    fireEvent.click(form.getByRole('button', { name: 'Record it done' }));
    expect(await main().findByText(/^Fuel filter: recorded done on /)).toBeTruthy();
    expect(patched(fetchMock)).toHaveLength(1);
    expect(Object.keys(patched(fetchMock)[0]!)).toEqual(['lastDoneOn']);
    cleanup();

    machineApi('bookkeeper');
    await openMachine();
    expect(await main().findByText('Fuel filter')).toBeTruthy();
    expect(main().queryByRole('button', { name: 'Record Fuel filter done' })).toBeNull();
  });
});
