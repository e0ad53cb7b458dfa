// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { healthQueries } from '../../src/features/health/api/queries';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
});

const banner = () => screen.getByRole('banner');
const main = () => screen.getByRole('main');

/** Signed out, on the sign-in page, where the API status panel sits under the form. */
async function openSignInWithHealth(health: FakeRoute) {
  const fetchMock = fakeApi({ ...session(null), 'GET /api/health': health });
  renderApp('/sign-in');
  await screen.findByRole('heading', { level: 1, name: 'Sign in' });
  return fetchMock;
}

describe('server status on the sign-in page and in the header', () => {
  it('says online when /api/health answers ok', async () => {
    const fetchMock = await openSignInWithHealth(() => jsonResponse(200, { ok: true }));

    expect(await within(main()).findByText('API online')).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toBe('●Server online');
    expect(within(main()).queryByText(/unreachable/)).toBeNull();
    expect(fetchMock).toHaveBeenCalledWith(
      '/api/health',
      expect.objectContaining({ credentials: 'include' }),
    );
  });

  it('says unreachable, and hints at npm start, when fetch itself fails', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('fetch failed');
      }),
    );
    renderApp('/sign-in');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    expect(await within(main()).findByText(/^API unreachable/)).toBeTruthy();
    expect(within(main()).getByText('npm start', { selector: 'code' })).toBeTruthy();
    expect(within(main()).getByText(/got no answer/)).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server unreachable');
    expect(within(main()).queryByText('API online')).toBeNull();
  });

  it('says unreachable, with the server’s own reason, when /api/health answers 500', async () => {
    await openSignInWithHealth(() =>
      jsonResponse(500, { error: { code: 'internal', message: 'The database is not open' } }),
    );

    expect(await within(main()).findByText(/^API unreachable/)).toBeTruthy();
    expect(within(main()).getByText(/answered 500 \(internal\): The database is not open/)).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server unreachable');
  });

  it('says not ready when the server answers but reports ok: false', async () => {
    await openSignInWithHealth(() => jsonResponse(200, { ok: false }));

    expect(await within(main()).findByText('API not ready')).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server not ready');
  });

  it('says checking while the health check has not answered yet', async () => {
    await openSignInWithHealth(() => new Promise<Response>(() => {}));

    expect(await within(main()).findByText('Checking the API…')).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Checking server…');
  });

  it('shows the header indicator on the signed-in pages too', async () => {
    fakeApi(session('owner'));
    renderApp('/mileage');

    await screen.findByRole('heading', { level: 1, name: 'Mileage' });
    expect(await within(banner()).findByText('Server online')).toBeTruthy();
  });

  it('says the sign-in cannot be checked, and offers a retry, when /me gets no answer', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('fetch failed');
      }),
    );
    renderApp('/week');

    const alert = await screen.findByRole('alert');
    expect(within(alert).getByText('Vanbay cannot check your sign-in')).toBeTruthy();
    expect(alert.textContent).toContain('Start it with npm start');
    expect(within(alert).getByRole('button', { name: 'Try again' })).toBeTruthy();
  });
});

describe('server status on signed-in pages', () => {
  it('shows the full API status, with its reason, only while the server is not answering', async () => {
    let healthy = true;
    let checking = false;
    fakeApi({
      ...session('owner'),
      'GET /api/health': () =>
        checking
          ? new Promise<Response>(() => {})
          : healthy
            ? jsonResponse(200, { ok: true })
            : jsonResponse(500, { error: { code: 'internal', message: 'The database is not open' } }),
    });
    const { queryClient } = renderApp('/mileage');
    await screen.findByRole('heading', { level: 1, name: 'Mileage' });
    await within(banner()).findByText('Server online');
    expect(within(main()).queryByText('API status')).toBeNull();

    healthy = false;
    await queryClient.refetchQueries({ queryKey: healthQueries.status().queryKey });

    expect(await within(main()).findByText(/^API unreachable/)).toBeTruthy();
    expect(within(main()).getByText(/answered 500 \(internal\): The database is not open/)).toBeTruthy();
    // A re-check keeps the panel up, its button saying so, instead of hiding it until the answer.
    checking = true;
    fireEvent.click(within(main()).getByRole('button', { name: 'Check again' }));
    expect(await within(main()).findByRole('button', { name: 'Checking…' })).toBeTruthy();
    expect(within(main()).getByText(/^API unreachable/)).toBeTruthy();

    checking = false;
    healthy = true;
    await queryClient.refetchQueries({ queryKey: healthQueries.status().queryKey });
    await waitFor(() => expect(within(main()).queryByText(/API unreachable|Checking the API/)).toBeNull());
  });

  it('does not re-ask in a loop when the very first probe fails', async () => {
    const fetchMock = fakeApi({
      ...session('owner'),
      'GET /api/health': () => jsonResponse(500, { error: { code: 'internal', message: 'Not open' } }),
    });
    renderApp('/mileage');

    expect(await screen.findByText(/^API unreachable/)).toBeTruthy();
    // With no answer ever cached, each re-ask resets the probe to "checking", which unmounted the
    // panel, whose next mount asked again: a tight loop. Only the 30 s poll may ask again.
    const probes = () => requestedPaths(fetchMock).filter((path) => path === '/api/health').length;
    const probesWhenShown = probes();
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(probes()).toBe(probesWhenShown);
    expect(screen.getByText(/^API unreachable/)).toBeTruthy();
  });
});
