/** The first tab stop on every page: straight past the header and the navigation. */
export function SkipLink() {
  return (
    <a
      href="#main"
      className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-10 focus:rounded-plate focus:bg-coolant focus:p-3 focus:text-on-coolant"
    >
      Skip to content
    </a>
  );
}
