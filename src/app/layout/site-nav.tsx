import { Link, useLocation } from 'react-router';
import type { Role } from '../../../shared/api/users';
import { sectionAt, sectionLabel, sectionsFor } from './sections';

// Active is inverted and bold, not only recoloured, so it still shows on a glare-washed screen.
const linkBase = 'flex min-h-touch items-center rounded-plate border-2 px-4 text-base whitespace-nowrap';
const linkIdle = 'border-transparent font-medium text-ink hover:border-rule';
const linkActive = 'border-ink bg-ink font-bold text-ground';

/**
 * Only the sections this role may use. The current one is marked for screen readers too
 * (aria-current), also on a page that lives under it elsewhere (a machine, under customers).
 */
export function SiteNav({ role }: { role: Role }) {
  const current = sectionAt(useLocation().pathname);
  return (
    <nav
      aria-label="Sections"
      className="border-b-2 border-rule bg-panel lg:w-64 lg:border-r-2 lg:border-b-0"
    >
      {/* One row that scrolls sideways on a phone, so the page starts near the top; a column at the desk. */}
      <ul className="flex gap-2 overflow-x-auto p-3 lg:flex-col lg:overflow-visible">
        {sectionsFor(role).map((section) => (
          <li key={section.path}>
            <Link
              to={section.path}
              aria-current={current === section ? 'page' : undefined}
              className={`${linkBase} ${current === section ? linkActive : linkIdle}`}
            >
              {sectionLabel(section, role)}
            </Link>
          </li>
        ))}
      </ul>
    </nav>
  );
}
