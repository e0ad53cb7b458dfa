import { describe, expect, it } from 'vitest';
import { returnPathFrom, signInPathReturningTo } from '../../src/app/sign-in-return';

const after = (next: string) => returnPathFrom(new URLSearchParams({ next }));

describe('where sign-in returns to', () => {
  it('keeps the path and query of the page the person wanted', () => {
    const signIn = signInPathReturningTo('/week?start=2026-11-16');
    expect(signIn).toBe('/sign-in?next=%2Fweek%3Fstart%3D2026-11-16');
    expect(returnPathFrom(new URL(signIn, 'http://vanbay.test').searchParams)).toBe('/week?start=2026-11-16');
    expect(signInPathReturningTo('/')).toBe('/sign-in');
  });

  it.each([
    // Open-redirect shapes from the OWASP Unvalidated Redirects and Forwards Cheat Sheet.
    'https://evil.example/week',
    '//evil.example/week',
    '/\\evil.example',
    'javascript:alert(1)',
    '',
    '/sign-in',
    '/sign-in?next=%2Fweek',
  ])('goes home instead of to %j', (next) => {
    expect(after(next)).toBe('/');
  });

  it('goes home when no next was given', () => {
    expect(returnPathFrom(new URLSearchParams())).toBe('/');
  });
});
