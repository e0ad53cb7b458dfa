// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/api/users';
import { demoUsers, fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { currentPath, jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
});

const DEMO_PASSWORD = 'vanbay-demo-2026';

/** Signed out, with `signIn` answering POST /api/auth/sign-in; a success also makes /me know the user. */
function signedOutWith(signIn: FakeRoute) {
  let signedIn: Role | null = null;
  return fakeApi({
    ...session(() => signedIn),
    'POST /api/auth/sign-in': async (request) => {
      const response = await signIn(request);
      if (response.ok) signedIn = 'owner';
      return response;
    },
  });
}

function fillAndSubmit(email: string, password: string) {
  fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: email } });
  fireEvent.change(screen.getByLabelText('Password'), { target: { value: password } });
  fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('signing in', () => {
  it('sends a signed-out visitor to the sign-in page, keeping where they were going', async () => {
    fakeApi(session(null));
    const { router } = renderApp('/mileage?year=2026');

    await screen.findByRole('heading', { level: 1, name: 'Sign in' });
    expect(currentPath(router)).toBe('/sign-in?next=%2Fmileage%3Fyear%3D2026');
    expect(screen.queryByRole('navigation', { name: 'Sections' })).toBeNull();
  });

  it('posts the e-mail and password, then opens the page the person was going to', async () => {
    const fetchMock = signedOutWith(() =>
      jsonResponse(200, { token: 'cli-only-token', user: demoUsers.owner }),
    );
    const { router } = renderApp('/invoices');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    fillAndSubmit('  owner@ridgeback.test ', DEMO_PASSWORD);

    await screen.findByRole('heading', { level: 1, name: 'Invoices' });
    expect(currentPath(router)).toBe('/invoices');
    const signInCall = fetchMock.mock.calls.find(([input]) => input === '/api/auth/sign-in');
    expect(signInCall?.[1]?.method).toBe('POST');
    // The address is trimmed; the password goes exactly as typed.
    expect(JSON.parse(String(signInCall?.[1]?.body))).toEqual({
      email: 'owner@ridgeback.test',
      password: DEMO_PASSWORD,
    });
    expect(within(screen.getByRole('banner')).getByText('Morgan Avery')).toBeTruthy();
    // The sign-in answer names the user, so /me is not asked again after it.
    const paths = requestedPaths(fetchMock);
    expect(paths.slice(paths.indexOf('/api/auth/sign-in')).includes('/api/auth/me')).toBe(false);
  });

  it('opens the role’s own first section when the person came straight to sign in', async () => {
    signedOutWith(() => jsonResponse(200, { token: 't', user: demoUsers.owner }));
    const { router } = renderApp('/sign-in');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    fillAndSubmit('owner@ridgeback.test', DEMO_PASSWORD);

    await waitFor(() => expect(router.state.location.pathname).toBe('/week'));
  });

  it('says the e-mail and password do not match on a 401, and clears the password', async () => {
    signedOutWith(() =>
      jsonResponse(401, { error: { code: 'bad_credentials', message: 'Wrong e-mail or password.' } }),
    );
    const { router } = renderApp('/sign-in');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    fillAndSubmit('owner@ridgeback.test', 'not-the-password');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('That e-mail and password do not match a Vanbay sign-in.');
    expect((screen.getByLabelText('Password') as HTMLInputElement).value).toBe('');
    expect((screen.getByLabelText('E-mail') as HTMLInputElement).value).toBe('owner@ridgeback.test');
    expect(currentPath(router)).toBe('/sign-in');
  });

  it.each([
    // The server's wait is in details.retryAfterSeconds (server/services/auth.ts); whole minutes, rounded up.
    [840, 'Wait 14 minutes, then try again.'],
    [60, 'Wait 1 minute, then try again.'],
    [61, 'Wait 2 minutes, then try again.'],
  ])('says how long to wait when sign-in is rate limited (%i s)', async (seconds, wait) => {
    signedOutWith(() =>
      jsonResponse(
        429,
        {
          error: {
            code: 'rate_limited',
            message: 'Too many failed sign-ins.',
            details: { retryAfterSeconds: seconds },
          },
        },
        { 'Retry-After': String(seconds) },
      ),
    );
    renderApp('/sign-in');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    fillAndSubmit('owner@ridgeback.test', 'guess');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('Too many failed sign-ins for this account.');
    expect(alert.textContent).toContain(wait);
  });

  it('says the server did not answer when sign-in gets no answer at all', async () => {
    signedOutWith(() => {
      throw new TypeError('fetch failed');
    });
    renderApp('/sign-in');
    await screen.findByRole('heading', { level: 1, name: 'Sign in' });

    fillAndSubmit('owner@ridgeback.test', DEMO_PASSWORD);

    expect((await screen.findByRole('alert')).textContent).toContain('No answer from the Vanbay server.');
  });

  it('moves a signed-in person on from the sign-in page', async () => {
    fakeApi(session('helper'));
    const { router } = renderApp('/sign-in');

    await screen.findByRole('heading', { level: 1, name: 'Jobs' });
    expect(router.state.location.pathname).toBe('/jobs');
  });

  it('ignores a `next` that leads off the site', async () => {
    fakeApi(session('owner'));
    const { router } = renderApp('/sign-in?next=%2F%2Fevil.example%2Fweek');

    await screen.findByRole('heading', { level: 1, name: 'Week' });
    expect(router.state.location.pathname).toBe('/week');
  });
});
