import { Navigate, useSearchParams } from 'react-router';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { ApiStatusPanel } from '../../features/health/components/api-status-panel';
import { ServerStatusBadge } from '../../features/health/components/server-status-badge';
import { useSession } from '../../features/session/api/queries';
import { SignInForm } from '../../features/session/components/sign-in-form';
import { SkipLink } from '../layout/skip-link';
import { returnPathFrom } from '../sign-in-return';

/**
 * Outside the frame: nothing here needs a session. Once the session query knows someone (this
 * form just signed them in, or they were already), they go on to where they were headed.
 */
export function Component() {
  const session = useSession();
  const [search] = useSearchParams();
  if (session.data) return <Navigate to={returnPathFrom(search)} replace />;
  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <header className="flex flex-wrap items-center justify-between gap-3 border-b-3 border-ink bg-panel px-4 py-3">
        <p className="flex min-h-touch items-center text-2xl font-bold tracking-tight">Vanbay</p>
        <ServerStatusBadge />
      </header>
      <main id="main" tabIndex={-1} className="mx-auto grid w-full max-w-lg content-start gap-6 p-4 lg:py-12">
        <div>
          <PageHeading title="Sign in">The desk side of the service bay: jobs, money, miles.</PageHeading>
          <Panel>
            <SignInForm />
          </Panel>
        </div>
        <ApiStatusPanel />
      </main>
    </div>
  );
}
