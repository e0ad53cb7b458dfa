import { Link, Outlet, useNavigation } from 'react-router';
import { ServerStatusBadge } from '../../features/health/components/server-status-badge';
import { paths } from '../paths';
import { SiteNav } from './site-nav';

export function AppFrame() {
  const navigation = useNavigation();
  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-10 focus:rounded-plate focus:bg-coolant focus:p-3 focus:text-on-coolant"
      >
        Skip to content
      </a>
      <header className="flex flex-wrap items-center justify-between gap-3 border-b-3 border-ink bg-panel px-4 py-3">
        <Link to={paths.week} className="flex min-h-touch items-center text-2xl font-bold tracking-tight">
          Vanbay
        </Link>
        <ServerStatusBadge />
      </header>
      <div className="flex flex-1 flex-col lg:flex-row">
        <SiteNav />
        <main
          id="main"
          tabIndex={-1}
          aria-busy={navigation.state === 'loading'}
          className="flex-1 p-4 lg:p-8"
        >
          <Outlet />
        </main>
      </div>
    </div>
  );
}
