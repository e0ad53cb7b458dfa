// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/api/users';
import { weekQueries } from '../../src/features/week/api/queries';
import { healthQueries } from '../../src/features/health/api/queries';
import { demoUsers, fakeApi, requestedPaths, session, unauthorized } from './fake-api';
import { sampleReport } from './week-sample';
import { currentPath, renderApp } from './render-app';

afterEach(() => {
  cleanup();
});

const nav = () => screen.getByRole('navigation', { name: 'Sections' });
const navLinks = () =>
  within(nav())
    .getAllByRole('link')
    .map((link) => [link.textContent, link.getAttribute('href')]);

/**
 * What each role is offered, from server/auth/policy.ts and PRODUCT.md ("Who uses it"): the week
 * report is reports.read (owner, bookkeeper); invoices.list leaves out the helper; trips.list and
 * reminders.list are staff only; settings (users, rates) are the owner's.
 */
const sectionsByRole: Record<Role, [string, string][]> = {
  owner: [
    ['Week', '/week'],
    ['Jobs', '/jobs'],
    ['Customers & machines', '/customers'],
    ['Invoices', '/invoices'],
    ['Mileage', '/mileage'],
    ['Reminders', '/reminders'],
    ['Settings', '/settings'],
  ],
  helper: [
    ['Jobs', '/jobs'],
    ['Customers & machines', '/customers'],
    ['Mileage', '/mileage'],
    ['Reminders', '/reminders'],
  ],
  bookkeeper: [
    ['Week', '/week'],
    ['Customers & machines', '/customers'],
    ['Invoices', '/invoices'],
    ['Mileage', '/mileage'],
  ],
  customer: [
    ['Your jobs', '/jobs'],
    ['Your machines', '/customers'],
    ['Your invoices', '/invoices'],
  ],
};

const homeByRole: Record<Role, [string, string]> = {
  owner: ['/week', 'Week'],
  helper: ['/jobs', 'Jobs'],
  bookkeeper: ['/week', 'Week'],
  customer: ['/jobs', 'Your jobs'],
};

const roleWords: Record<Role, string> = {
  owner: 'Owner',
  helper: 'Helper',
  bookkeeper: 'Bookkeeper',
  customer: 'Customer',
};

const roles = Object.keys(sectionsByRole) as Role[];

describe('navigation by role', () => {
  it.each(roles)('offers the %s only the sections that role may use, in order', async (role) => {
    fakeApi(session(role));
    const [homePath, homeHeading] = homeByRole[role];
    const { router } = renderApp('/');

    await screen.findByRole('heading', { level: 1, name: homeHeading });
    expect(router.state.location.pathname).toBe(homePath);
    expect(navLinks()).toEqual(sectionsByRole[role]);
  });

  it.each(roles)('names the signed-in %s and their role in the header', async (role) => {
    fakeApi(session(role));
    renderApp('/');

    const banner = await screen.findByRole('banner');
    expect(await within(banner).findByText(demoUsers[role].name)).toBeTruthy();
    expect(within(banner).getByText(roleWords[role])).toBeTruthy();
    expect(within(banner).getByRole('button', { name: 'Sign out' })).toBeTruthy();
  });

  it.each([
    ['helper', '/week', 'Week'],
    ['helper', '/invoices', 'Invoices'],
    ['bookkeeper', '/jobs', 'Jobs'],
    ['customer', '/mileage', 'Mileage'],
    ['customer', '/settings', 'Settings'],
  ] as const)(
    'refuses the %s %s inside the frame and asks the server for nothing from it',
    async (role, path, label) => {
      const fetchMock = fakeApi(session(role));
      renderApp(path);

      await screen.findByRole('heading', { level: 1, name: 'Not open to your role' });
      const main = within(screen.getByRole('main'));
      expect(
        main.getByText(new RegExp(`^${label} is not part of what a ${role} sign-in can use`)),
      ).toBeTruthy();
      const [homePath, homeLabel] = homeByRole[role];
      expect(main.getByRole('link', { name: `Go to ${homeLabel}` }).getAttribute('href')).toBe(homePath);
      expect(requestedPaths(fetchMock).every((p) => p === '/api/health' || p === '/api/auth/me')).toBe(true);
    },
  );
});

describe('the dashboard frame', () => {
  it('marks only the current section with aria-current, and moves the mark on navigation', async () => {
    fakeApi(session('owner'));
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

  it("marks the customers section on a machine's page, which lives under it", async () => {
    fakeApi(session('owner'));
    renderApp('/machines/3');
    const link = await within(await screen.findByRole('navigation', { name: 'Sections' })).findByRole(
      'link',
      {
        name: 'Customers & machines',
      },
    );
    expect(link.getAttribute('aria-current')).toBe('page');
  });

  it.each(sectionsByRole.owner)('opens %s under its own heading', async (label, path) => {
    // Every list the sections ask for answers empty: the frame and the heading are what is proved here.
    fakeApi({ ...session('owner') });
    renderApp(path);
    expect(await screen.findByRole('heading', { level: 1, name: label })).toBeTruthy();
  });

  it('shows a not-found page inside the frame, pointing back to the role’s own start', async () => {
    fakeApi(session('helper'));
    renderApp('/no-such-page');

    await screen.findByRole('heading', { level: 1, name: 'Page not found' });
    const main = within(screen.getByRole('main'));
    expect(main.getByText('/no-such-page')).toBeTruthy();
    expect(main.getByRole('link', { name: 'Back to Jobs' }).getAttribute('href')).toBe('/jobs');
    expect(
      within(nav())
        .getAllByRole('link')
        .some((link) => link.hasAttribute('aria-current')),
    ).toBe(false);
  });
});

describe('signing out', () => {
  it('signs out, forgets the person’s data and opens the sign-in page without a way back in', async () => {
    let who: Role | null = 'owner';
    const fetchMock = fakeApi({
      ...session(() => who),
      'POST /api/auth/sign-out': () => {
        who = null;
        return new Response(null, { status: 204 });
      },
    });
    const { router, queryClient } = renderApp('/jobs');
    await screen.findByRole('heading', { level: 1, name: 'Jobs' });
    const earlierWeek = weekQueries.report(sampleReport.start).queryKey;
    queryClient.setQueryData(earlierWeek, sampleReport);

    fireEvent.click(within(screen.getByRole('banner')).getByRole('button', { name: 'Sign out' }));

    await screen.findByRole('heading', { level: 1, name: 'Sign in' });
    // No ?next=: the next person to sign in starts at their own home, not at the last one's page.
    expect(currentPath(router)).toBe('/sign-in');
    expect(requestedPaths(fetchMock)).toContain('/api/auth/sign-out');
    expect(queryClient.getQueryData(earlierWeek)).toBeUndefined();
    // The health probe is the same for anyone, so the header badge keeps its answer.
    expect(queryClient.getQueryData(healthQueries.status().queryKey)).toEqual({ ok: true });
  });

  it('sends the person to sign in, and back afterwards, when the session lapses under a page', async () => {
    let who: Role | null = 'owner';
    fakeApi({
      ...session(() => who),
      'GET /api/reports/week': () => {
        who = null;
        return unauthorized();
      },
    });
    const { router } = renderApp('/week?start=2026-11-16');

    await screen.findByRole('heading', { level: 1, name: 'Sign in' });
    await waitFor(() => expect(currentPath(router)).toBe('/sign-in?next=%2Fweek%3Fstart%3D2026-11-16'));
  });
});
