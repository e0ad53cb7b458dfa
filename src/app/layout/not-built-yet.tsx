import type { ReactNode } from 'react';
import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from './sections';

type NotBuiltYetProps = {
  /** The section's path: its heading is the navigation's label for this role. */
  path: string;
  children: ReactNode;
  /** What a customer will find here, when it differs from the workshop's account. */
  forCustomer?: ReactNode;
};

/** The honest placeholder for a section whose screens do not exist yet: it shows no data at all. */
export function NotBuiltYet({ path, children, forCustomer }: NotBuiltYetProps) {
  const { role } = useSessionUser();
  return (
    <>
      <PageHeading title={labelOf(path, role)} />
      <EmptyState title="This section is not built yet">
        <p>{role === 'customer' && forCustomer ? forCustomer : children}</p>
        <p className="mt-2">Nothing is shown here until it is built.</p>
      </EmptyState>
    </>
  );
}
