import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/panel';
import { toneClasses, toneGlyphs } from '../../../components/ui/tone';
import { ApiError } from '../../../lib/api-client';
import { useServerStatus } from '../api/queries';
import type { ServerStatus } from '../api/queries';
import { statusTone } from './status-labels';

/** The home page's plain-words account of the API, with the reason when it is not answering. */
export function ApiStatusPanel() {
  const { status, error, recheck, isRechecking } = useServerStatus();
  return (
    <Panel>
      <h2 className="text-sm font-bold uppercase tracking-wider text-ink-soft">API status</h2>
      <p
        className={`mt-3 inline-flex items-center gap-3 rounded-plate border-3 px-4 py-2 text-2xl font-bold ${toneClasses[statusTone[status]]}`}
      >
        <span aria-hidden="true">{toneGlyphs[statusTone[status]]}</span>
        <StatusHeadline status={status} />
      </p>
      <p className="mt-3 max-w-prose text-lg text-ink-soft">{explanation(status, error)}</p>
      {status === 'checking' ? null : (
        <Button className="mt-4" onClick={recheck} disabled={isRechecking}>
          {isRechecking ? 'Checking…' : 'Check again'}
        </Button>
      )}
    </Panel>
  );
}

function StatusHeadline({ status }: { status: ServerStatus }) {
  switch (status) {
    case 'checking':
      return <span>Checking the API…</span>;
    case 'online':
      return <span>API online</span>;
    case 'not-ready':
      return <span>API not ready</span>;
    case 'unreachable':
      return (
        <span>
          API unreachable — is <code className="font-mono">npm start</code> running?
        </span>
      );
  }
}

function explanation(status: ServerStatus, error: Error | null): string {
  switch (status) {
    case 'checking':
      return 'Asking the Vanbay server whether it is up.';
    case 'online':
      return 'The Vanbay server answered its health check.';
    case 'not-ready':
      return 'The Vanbay server answered, but reports that it is not ready yet.';
    case 'unreachable':
      return unreachableReason(error);
  }
}

function unreachableReason(error: Error | null): string {
  if (error instanceof ApiError && error.status > 0) {
    return `The health check failed: the server answered ${error.status} (${error.code}): ${error.message}`;
  }
  return 'The health check got no answer. Start the server with npm start on this machine, then check again.';
}
