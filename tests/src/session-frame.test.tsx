// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/api/users';
import { demoUsers, fakeApi, requestedPaths, session, unauthorized } from './fake-api';
import { currentPath, jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
});

describe('the session check and the signed-in frame', () => {
  it('asks /me before the frame is shown, and shows the frame once /me names the person', async () => {
    const fetchMock = fakeApi(session('owner'));
    renderApp('/jobs');

    expect(await screen.findByText('Checking your sign-in…')).toBeTruthy();
    const banner = await screen.findByRole('banner');
    expect(within(banner).getByText('Morgan Avery')).toBeTruthy();
    expect(requestedPaths(fetchMock)[0]).toBe('/api/auth/me');
  });

  it('forgets a sign-out at the next sign-in: a session that lapses later comes back to its page', async () => {
    let who: Role | null = 'owner';
    let lapseOnWeek = false;
    fakeApi({
      ...session(() => who),
      'POST /api/auth/sign-out': () => {
        who = null;
        return new Response(null, { status: 204 });
      },
      'POST /api/auth/sign-in': () => {
        who = 'owner';
        return jsonResponse(200, { token: 'not-a-real-token', user: demoUsers.owner });
      },
      'GET /api/reports/week': () => {
        if (!lapseOnWeek)
          return jsonResponse(500, { error: { code: 'not_here', message: 'not in this test' } });
        who = null;
        return unauthorized();
      },
    });
    const { router } = renderApp('/jobs');
    fireEvent.click(within(await screen.findByRole('banner')).getByRole('button', { name: 'Sign out' }));
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });
    expect(currentPath(router)).toBe('/sign-in');

    lapseOnWeek = true;
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: demoUsers.owner.email } });
    fireEvent.change(screen.getByLabelText('Password'), { target: { value: 'vanbay-demo-2026' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    // The owner's home is the week; its report finds the session gone, and the way back is kept.
    await waitFor(() => expect(currentPath(router)).toMatch(/^\/sign-in\?next=%2Fweek/));
  });
});
