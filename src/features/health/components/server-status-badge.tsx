import { StatusPill } from '../../../components/ui/status-pill';
import { useServerStatus } from '../api/queries';
import type { ServerStatus } from '../api/queries';
import { statusTone } from './status-labels';

const badgeText: Record<ServerStatus, string> = {
  checking: 'Checking server…',
  online: 'Server online',
  'not-ready': 'Server not ready',
  unreachable: 'Server unreachable',
};

/** The header's indicator. A live region, so a screen reader hears the server drop on any page. */
export function ServerStatusBadge() {
  const { status } = useServerStatus();
  return (
    <div role="status">
      <StatusPill tone={statusTone[status]}>{badgeText[status]}</StatusPill>
    </div>
  );
}
