// @vitest-environment jsdom
import { cleanup, fireEvent, screen, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, renderApp } from './render-app';

beforeEach(() => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async () => jsonResponse(200, { ok: true })),
  );
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const nav = () => screen.getByRole('navigation', { name: 'Sections' });

const unbuiltSections = [
  ['/jobs', 'Jobs'],
  ['/customers', 'Customers & machines'],
  ['/invoices', 'Invoices'],
  ['/mileage', 'Mileage'],
  ['/reminders', 'Reminders'],
  ['/settings', 'Settings'],
] as const;

describe('the dashboard frame', () => {
  it('names the app and lists every section in the navigation, in order', async () => {
    renderApp('/');

    await screen.findByRole('heading', { level: 1, name: 'Week' });
    expect(within(screen.getByRole('banner')).getByRole('link', { name: 'Vanbay' })).toBeTruthy();
    const links = within(nav()).getAllByRole('link');
    expect(links.map((link) => link.textContent)).toEqual([
      'Week',
      'Jobs',
      'Customers & machines',
      'Invoices',
      'Mileage',
      'Reminders',
      'Settings',
    ]);
    expect(links.map((link) => link.getAttribute('href'))).toEqual([
      '/',
      ...unbuiltSections.map(([path]) => path),
    ]);
  });

  it('marks only the current section with aria-current, and moves the mark on navigation', async () => {
    renderApp('/jobs');

    await screen.findByRole('heading', { level: 1, name: 'Jobs' });
    const current = () =>
      within(nav())
        .getAllByRole('link')
        .filter((link) => link.getAttribute('aria-current'));
    expect(current().map((link) => [link.textContent, link.getAttribute('aria-current')])).toEqual([
      ['Jobs', 'page'],
    ]);

    fireEvent.click(within(nav()).getByRole('link', { name: 'Invoices' }));

    await screen.findByRole('heading', { level: 1, name: 'Invoices' });
    expect(current().map((link) => link.textContent)).toEqual(['Invoices']);
  });

  it.each(unbuiltSections)('says %s is not built yet and shows no data', async (path, label) => {
    renderApp(path);

    await screen.findByRole('heading', { level: 1, name: label });
    expect(
      within(screen.getByRole('main')).getByRole('heading', { name: 'This section is not built yet' }),
    ).toBeTruthy();
    expect(within(screen.getByRole('main')).queryByRole('table')).toBeNull();
    // The health probe is the only request a not-built section may cause.
    expect(vi.mocked(fetch).mock.calls.every(([input]) => input === '/api/health')).toBe(true);
  });

  it('shows a not-found page inside the frame for an unknown route', async () => {
    renderApp('/no-such-page');

    await screen.findByRole('heading', { level: 1, name: 'Page not found' });
    expect(within(screen.getByRole('main')).getByText('/no-such-page')).toBeTruthy();
    expect(
      within(screen.getByRole('main')).getByRole('link', { name: 'Back to Week' }).getAttribute('href'),
    ).toBe('/');
    expect(nav()).toBeTruthy();
    expect(
      within(nav())
        .getAllByRole('link')
        .some((link) => link.hasAttribute('aria-current')),
    ).toBe(false);
  });
});
