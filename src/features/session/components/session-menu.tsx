import type { SessionUser } from '../../../../shared/api/auth';
import { Button } from '../../../components/ui/button';
import { ApiError } from '../../../lib/api-client';
import { roleLabels } from './role-labels';

type SessionMenuProps = {
  user: SessionUser;
  onSignOut: () => void;
  isSigningOut: boolean;
  signOutError: Error | null;
};

/**
 * Who is signed in, and the way out. The sign-out itself is run by the frame, which must know a
 * sign-out from an expired session to decide where the sign-in page sends the next person.
 */
export function SessionMenu({ user, onSignOut, isSigningOut, signOutError }: SessionMenuProps) {
  return (
    <div className="flex flex-wrap items-center gap-3">
      <p className="flex flex-col leading-tight">
        <span className="text-lg font-bold">{user.name}</span>
        <span className="text-sm font-medium text-ink-soft">{roleLabels[user.role]}</span>
      </p>
      <Button variant="secondary" onClick={onSignOut} disabled={isSigningOut}>
        {isSigningOut ? 'Signing out…' : 'Sign out'}
      </Button>
      {signOutError ? (
        <p role="alert" className="w-full text-base font-bold text-fail">
          {signOutFailure(signOutError)}
        </p>
      ) : null}
    </div>
  );
}

function signOutFailure(error: Error): string {
  if (error instanceof ApiError && error.status === 0) {
    return 'Not signed out: the server did not answer. Try again once it is reachable.';
  }
  return `Not signed out: ${error.message}`;
}
