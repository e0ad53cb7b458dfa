import { useServerStatus } from '../api/queries';
import { ApiStatusPanel } from './api-status-panel';

/**
 * On signed-in pages, the API status in full only when something is wrong: a page showing figures
 * fetched before the server stopped must not pass for live, and the reason and the way to fix it
 * (npm start) belong where the person is looking, not only in the header's badge.
 */
export function ServerProblem() {
  const { status, failedBefore } = useServerStatus();
  // Kept up through a re-check after a failure, so the panel does not vanish and return every poll.
  if (status === 'online' || (status === 'checking' && !failedBefore)) return null;
  return (
    <div className="mb-6">
      <ApiStatusPanel />
    </div>
  );
}
