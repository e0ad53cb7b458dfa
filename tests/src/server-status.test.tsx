// @vitest-environment jsdom
import { cleanup, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const banner = () => screen.getByRole('banner');
const main = () => screen.getByRole('main');

describe('server status on the home page and in the header', () => {
  it('says online when /api/health answers ok', async () => {
    const fetchMock = vi.fn(async () => jsonResponse(200, { ok: true }));
    vi.stubGlobal('fetch', fetchMock);

    renderApp('/');

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

    renderApp('/');

    expect(await within(main()).findByText(/^API unreachable/)).toBeTruthy();
    expect(within(main()).getByText('npm start', { selector: 'code' })).toBeTruthy();
    expect(within(main()).getByText(/got no answer/)).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server unreachable');
    expect(within(main()).queryByText('API online')).toBeNull();
  });

  it('says unreachable, with the server’s own reason, when /api/health answers 500', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        jsonResponse(500, { error: { code: 'internal', message: 'The database is not open' } }),
      ),
    );

    renderApp('/');

    expect(await within(main()).findByText(/^API unreachable/)).toBeTruthy();
    expect(within(main()).getByText(/answered 500 \(internal\): The database is not open/)).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server unreachable');
  });

  it('says not ready when the server answers but reports ok: false', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(200, { ok: false })),
    );

    renderApp('/');

    expect(await within(main()).findByText('API not ready')).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Server not ready');
  });

  it('says checking while the health check has not answered yet', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(() => new Promise<Response>(() => {})),
    );

    renderApp('/');

    expect(await within(main()).findByText('Checking the API…')).toBeTruthy();
    expect(within(banner()).getByRole('status').textContent).toContain('Checking server…');
  });

  it('shows the header indicator on pages other than home too', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(200, { ok: true })),
    );

    renderApp('/mileage');

    await screen.findByRole('heading', { level: 1, name: 'Mileage' });
    expect(await within(banner()).findByText('Server online')).toBeTruthy();
  });
});
