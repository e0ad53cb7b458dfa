import { Link, useLocation } from 'react-router';
import { buttonClasses } from '../../components/ui/button';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { useSessionUser } from '../../features/session/api/queries';
import { homePathFor, labelOf } from '../layout/sections';

export function Component() {
  const { pathname } = useLocation();
  const { role } = useSessionUser();
  const home = homePathFor(role);
  return (
    <>
      <PageHeading title="Page not found" />
      <Panel>
        <p className="text-lg">
          There is no page at <code className="font-mono font-bold break-all">{pathname}</code>.
        </p>
        <Link to={home} className={`mt-4 ${buttonClasses()}`}>
          Back to {labelOf(home, role)}
        </Link>
      </Panel>
    </>
  );
}
