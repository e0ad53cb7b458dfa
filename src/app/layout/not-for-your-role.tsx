import { Link } from 'react-router';
import type { Role } from '../../../shared/api/users';
import { buttonClasses } from '../../components/ui/button';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { roleLabels } from '../../features/session/components/role-labels';
import { homePathFor, labelOf, sectionLabel } from './sections';
import type { Section } from './sections';

/** In place of a section this role may not use: says so plainly and offers the way to its own start. */
export function NotForYourRole({ section, role }: { section: Section; role: Role }) {
  const home = homePathFor(role);
  return (
    <>
      <PageHeading title="Not open to your role" />
      <Panel>
        <p className="text-lg">
          {sectionLabel(section, role)} is not part of what a {roleLabels[role].toLowerCase()} sign-in can
          use, so nothing from it is shown here.
        </p>
        <Link to={home} className={`mt-4 ${buttonClasses()}`}>
          Go to {labelOf(home, role)}
        </Link>
      </Panel>
    </>
  );
}
