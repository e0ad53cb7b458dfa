import { Link, useLocation } from 'react-router';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { paths } from '../paths';

export function Component() {
  const { pathname } = useLocation();
  return (
    <>
      <PageHeading title="Page not found" />
      <Panel>
        <p className="text-lg">
          There is no page at <code className="font-mono font-bold break-all">{pathname}</code>.
        </p>
        <Link
          to={paths.week}
          className="mt-4 inline-flex min-h-touch items-center rounded-plate bg-coolant px-5 font-bold text-on-coolant"
        >
          Back to Week
        </Link>
      </Panel>
    </>
  );
}
