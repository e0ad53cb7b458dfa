import { Button } from '../../components/ui/button';
import { AlertPanel } from '../../components/ui/alert-panel';
import { ApiError } from '../../lib/api-client';

/** While /me has not answered: a quiet full-page line, so no page flashes before we know who this is. */
export function SessionChecking() {
  return (
    <main className="grid min-h-dvh place-items-center p-4" aria-busy="true">
      <p className="text-xl text-ink-soft">Checking your sign-in…</p>
    </main>
  );
}

/** /me failed in a way that says nothing about the session (no server, a 500): say so, offer a retry. */
export function SessionUnknown({ error, onRetry }: { error: Error; onRetry: () => void }) {
  return (
    <main className="mx-auto grid min-h-dvh max-w-xl content-center gap-4 p-4">
      <AlertPanel title="Vanbay cannot check your sign-in">
        <p>{reason(error)}</p>
        <Button className="mt-4" onClick={onRetry}>
          Try again
        </Button>
      </AlertPanel>
    </main>
  );
}

function reason(error: Error): string {
  if (error instanceof ApiError && error.status === 0) {
    return 'The Vanbay server did not answer. Start it with npm start on this machine, then try again.';
  }
  if (error instanceof ApiError)
    return `The server answered ${error.status} (${error.code}): ${error.message}`;
  return error.message;
}
