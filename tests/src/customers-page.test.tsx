// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { fakeApi, requestedPaths, session } from './fake-api';
import { jules, julesAsCustomer, larch, list, quillback, rowan } from './machine-sample';
import { currentPath, jsonResponse, renderApp } from './render-app';

// The page's lazy module is transformed on first import, which on a busy machine can outlast
// Testing Library's wait; importing it once up front leaves each test only the page's own work.
beforeAll(async () => {
  await import('../../src/app/routes/customers');
  await import('../../src/app/routes/customer');
  await import('../../src/app/routes/machine');
});

afterEach(() => {
  cleanup();
});

const main = () => within(screen.getByRole('main'));

describe('the customers page for the workshop', () => {
  it('pages through customers with the server’s cursor', async () => {
    const fetchMock = fakeApi({
      ...session('owner'),
      'GET /api/customers': ({ url }) =>
        url.searchParams.get('cursor') === 'after-2'
          ? jsonResponse(200, list([jules]))
          : jsonResponse(200, list([rowan], 'after-2')),
      'GET /api/machines': () => jsonResponse(200, list([quillback, larch])),
    });
    renderApp('/customers');
    await screen.findByRole('heading', { level: 1, name: 'Customers & machines' });
    expect(await main().findByRole('link', { name: 'Rowan Delacroix' })).toBeTruthy();
    expect(main().queryByRole('link', { name: 'Jules Marchetti' })).toBeNull();

    fireEvent.click(main().getByRole('button', { name: 'Show more customers' }));
    const link = await main().findByRole('link', { name: 'Jules Marchetti' });
    expect(link.getAttribute('href')).toBe('/customers/1');
    expect(main().getByRole('link', { name: 'Rowan Delacroix' })).toBeTruthy();
    expect(requestedPaths(fetchMock).filter((path) => path.startsWith('/api/customers'))).toEqual([
      '/api/customers?limit=25',
      '/api/customers?limit=25&cursor=after-2',
    ]);
    expect(main().queryByRole('button', { name: 'Show more customers' })).toBeNull();
  });

  it('searches both lists from the address and says what to do when nothing matches', async () => {
    const fetchMock = fakeApi({
      ...session('helper'),
      'GET /api/customers': () => jsonResponse(200, list([])),
      'GET /api/machines': () => jsonResponse(200, list([])),
    });
    const { router } = renderApp('/customers');
    await screen.findByRole('heading', { level: 1, name: 'Customers & machines' });
    fireEvent.change(main().getByLabelText('Search'), { target: { value: 'quill' } });
    fireEvent.click(main().getByRole('button', { name: 'Search' }));

    expect(await main().findByText('No customer matches')).toBeTruthy();
    expect(await main().findByText('No machine matches')).toBeTruthy();
    expect(currentPath(router)).toBe('/customers?q=quill');
    const asked = requestedPaths(fetchMock);
    expect(asked).toContain('/api/customers?q=quill&limit=25');
    expect(asked).toContain('/api/machines?q=quill&limit=25');
  });

  it('adds a customer and opens their record', async () => {
    let posted: unknown = null;
    fakeApi({
      ...session('owner'),
      'GET /api/customers': () => jsonResponse(200, list([])),
      'GET /api/machines': () => jsonResponse(200, list([])),
      'POST /api/customers': ({ init }) => {
        posted = JSON.parse(String(init?.body));
        return jsonResponse(201, {
          ...rowan,
          id: 12,
          name: 'Otis Fairweather',
          email: null,
          addressLines: [],
        });
      },
      'GET /api/customers/12': () => jsonResponse(200, { ...rowan, id: 12, name: 'Otis Fairweather' }),
    });
    const { router } = renderApp('/customers');
    await screen.findByRole('heading', { level: 1, name: 'Customers & machines' });
    fireEvent.click(await main().findByRole('button', { name: 'New customer' }));
    const form = within(main().getByRole('form', { name: 'New customer' }));
    fireEvent.change(form.getByLabelText('Name'), { target: { value: '  Otis Fairweather ' } });
    fireEvent.change(form.getByLabelText('Address'), { target: { value: '95 Cutbank Way\n\n' } });
    fireEvent.change(form.getByLabelText('E-mail'), { target: { value: 'not an address' } });
    fireEvent.click(form.getByRole('button', { name: 'Add the customer' }));
    expect(await form.findByText('An e-mail address, e.g. name@example.test.')).toBeTruthy();
    expect(posted).toBeNull();

    fireEvent.change(form.getByLabelText('E-mail'), { target: { value: '' } });
    fireEvent.click(form.getByRole('button', { name: 'Add the customer' }));
    await screen.findByRole('heading', { level: 1, name: 'Otis Fairweather' });
    expect(currentPath(router)).toBe('/customers/12');
    expect(posted).toEqual({
      name: 'Otis Fairweather',
      email: null,
      phone: null,
      addressLines: ['95 Cutbank Way'],
      town: null,
      notes: null,
    });
  });
});

describe('a customer’s record', () => {
  it('adds a machine to the customer, VIN checked and sent in capitals, and opens it', async () => {
    let posted: Record<string, unknown> | null = null;
    fakeApi({
      ...session('helper'),
      'GET /api/customers/1': () => jsonResponse(200, jules),
      'GET /api/machines': () => jsonResponse(200, list([])),
      'POST /api/machines': ({ init }) => {
        posted = JSON.parse(String(init?.body)) as Record<string, unknown>;
        return jsonResponse(201, { ...quillback, id: 30 });
      },
      'GET /api/machines/30': () => jsonResponse(200, { ...quillback, id: 30 }),
      'GET /api/machines/30/history': () => jsonResponse(200, { machineId: 30, meterUnit: 'mi', jobs: [] }),
      'GET /api/machines/30/intervals': () => jsonResponse(200, list([])),
    });
    const { router } = renderApp('/customers/1');
    await screen.findByRole('heading', { level: 1, name: 'Jules Marchetti' });
    expect(await main().findByText('No machines on this record yet')).toBeTruthy();
    fireEvent.click(main().getByRole('button', { name: 'Add a machine' }));
    const form = within(main().getByRole('form', { name: 'New machine' }));
    fireEvent.change(form.getByLabelText('Year'), { target: { value: '2019' } });
    fireEvent.change(form.getByLabelText('Make'), { target: { value: 'Kestrel' } });
    fireEvent.change(form.getByLabelText('Model'), { target: { value: 'Quillback 650' } });
    // The 49 CFR 565.15 worked example, typed in lower case.
    fireEvent.change(form.getByLabelText('VIN'), { target: { value: '1m8gdm9axkp042788' } });
    fireEvent.change(form.getByLabelText('Meter reading'), { target: { value: '18,420' } });
    fireEvent.click(form.getByRole('button', { name: 'Add the machine' }));

    await screen.findByRole('heading', { level: 1, name: '2019 Kestrel Quillback 650' });
    expect(currentPath(router)).toBe('/machines/30');
    expect(posted).toEqual({
      customerId: 1,
      kind: 'motorcycle',
      year: 2019,
      make: 'Kestrel',
      model: 'Quillback 650',
      vin: '1M8GDM9AXKP042788',
      otherId: null,
      meterUnit: 'mi',
      meterReading: 18420,
      notes: null,
    });
  });
});

describe('for the customer', () => {
  function customerApi() {
    return fakeApi({
      ...session('customer'),
      'GET /api/customers/1': () => jsonResponse(200, julesAsCustomer),
      'GET /api/machines': () => jsonResponse(200, list([quillback, larch])),
    });
  }

  it('“Your machines” shows their own record and machines, and no edit control', async () => {
    const fetchMock = customerApi();
    renderApp('/customers');
    await screen.findByRole('heading', { level: 1, name: 'Your machines' });
    const machines = within(await main().findByRole('table', { name: 'Your machines' }));
    expect(machines.getByRole('link', { name: '2019 Kestrel Quillback 650' }).getAttribute('href')).toBe(
      '/machines/1',
    );
    expect(machines.getByText('TLA-570-220917')).toBeTruthy();
    expect(await main().findByText('12 Larkspur Lane')).toBeTruthy();

    expect(main().queryAllByRole('button')).toEqual([]);
    expect(main().queryByRole('textbox')).toBeNull();
    expect(main().queryByRole('searchbox')).toBeNull();
    // Only their own record is asked for: never the list of customers.
    const asked = requestedPaths(fetchMock);
    expect(asked.some((path) => path.startsWith('/api/customers?'))).toBe(false);
    expect(asked).toContain('/api/machines?customerId=1&limit=25');
  });

  it('on another customer’s address says it is not theirs (the server answers 404)', async () => {
    customerApi();
    renderApp('/customers/2');
    await screen.findByRole('heading', { level: 1, name: 'No such customer' });
    await waitFor(() => expect(main().getByText(/This is not your record/)).toBeTruthy());
  });
});
