// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { fakeApi, session } from './fake-api';
import { currentPath, jsonResponse, renderApp } from './render-app';

afterEach(cleanup);

const emptyList = () => jsonResponse(200, { items: [], nextCursor: null });

function press(...keys: string[]) {
  for (const key of keys) fireEvent.keyDown(window, { key });
}

describe('keyboard shortcuts', () => {
  it('go to a section with g and a letter, and n books a new job for the workshop', async () => {
    fakeApi({ ...session('owner'), 'GET /api/jobs': emptyList, 'GET /api/invoices': emptyList });
    const { router } = renderApp('/jobs');
    await screen.findByRole('heading', { level: 1, name: 'Jobs' });

    press('g', 'i');
    await waitFor(() => expect(currentPath(router)).toBe('/invoices'));
    press('n');
    await waitFor(() => expect(currentPath(router)).toBe('/jobs?new=1'));
    expect(await screen.findByRole('heading', { name: 'New job' })).toBeTruthy();
  });

  it('leaves keys typed into a field alone, and offers a role only its own sections', async () => {
    fakeApi({ ...session('bookkeeper'), 'GET /api/invoices': emptyList });
    const { router } = renderApp('/invoices');
    await screen.findByRole('heading', { level: 1, name: 'Invoices' });

    // The bookkeeper keeps the books: no jobs section, no booking.
    press('g', 'j');
    press('n');
    expect(currentPath(router)).toBe('/invoices');

    const field = document.createElement('input');
    document.body.append(field);
    fireEvent.keyDown(field, { key: 'g' });
    fireEvent.keyDown(field, { key: 'w' });
    expect(currentPath(router)).toBe('/invoices');
    field.remove();

    press('?');
    const list = await screen.findByRole('heading', { name: 'Keyboard shortcuts', hidden: true });
    const dialog = list.closest('dialog')!;
    expect(dialog.textContent).toContain('Go to the week');
    expect(dialog.textContent).not.toContain('Go to jobs');
    expect(dialog.textContent).not.toContain('New job');
  });
});
