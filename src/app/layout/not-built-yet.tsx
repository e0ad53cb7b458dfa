import type { ReactNode } from 'react';
import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';

type NotBuiltYetProps = { section: string; children: ReactNode };

/** The honest placeholder for a section whose screens do not exist yet: it shows no data at all. */
export function NotBuiltYet({ section, children }: NotBuiltYetProps) {
  return (
    <>
      <PageHeading title={section} />
      <EmptyState title="This section is not built yet">
        <p>{children}</p>
        <p className="mt-2">Nothing is shown here until it is built.</p>
      </EmptyState>
    </>
  );
}
