import { NavLink } from 'react-router';
import { sections } from './sections';

// Active is inverted and bold, not only recoloured, so it still shows on a glare-washed screen.
const linkBase = 'flex min-h-touch items-center rounded-plate border-2 px-4 text-base whitespace-nowrap';
const linkIdle = 'border-transparent font-medium text-ink hover:border-rule';
const linkActive = 'border-ink bg-ink font-bold text-ground';

/** NavLink sets aria-current="page" on the active link itself. */
export function SiteNav() {
  return (
    <nav
      aria-label="Sections"
      className="border-b-2 border-rule bg-panel lg:w-64 lg:border-r-2 lg:border-b-0"
    >
      <ul className="flex flex-wrap gap-2 p-3 lg:flex-col">
        {sections.map((section) => (
          <li key={section.path}>
            <NavLink
              to={section.path}
              className={({ isActive }) => `${linkBase} ${isActive ? linkActive : linkIdle}`}
            >
              {section.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
