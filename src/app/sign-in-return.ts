import { paths } from './paths';

const NEXT_PARAM = 'next';

/** The sign-in page's address for someone who was going to `target` (path + search). */
export function signInPathReturningTo(target: string): string {
  if (target === paths.home) return paths.signIn;
  return `${paths.signIn}?${new URLSearchParams({ [NEXT_PARAM]: target })}`;
}

/**
 * Where to go after signing in: the `next` the sign-in page was given, when it is a path on this
 * site. Anything else (another origin, "//host", a backslash trick) goes home instead, so a crafted
 * link cannot use the sign-in page to send someone elsewhere.
 */
export function returnPathFrom(search: URLSearchParams): string {
  const next = search.get(NEXT_PARAM);
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.includes('\\')) return paths.home;
  if (next === paths.signIn || next.startsWith(`${paths.signIn}?`)) return paths.home;
  return next;
}
