import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';
import { ApiStatusPanel } from '../../features/health/components/api-status-panel';

export function Component() {
  return (
    <>
      <PageHeading title="Week" />
      <div className="grid gap-6">
        <ApiStatusPanel />
        <EmptyState title="The week review is not built yet">
          <p>
            Jobs done, hours billed, money in and owed, miles driven and machines coming due will be summed up
            here once the review is built. Until then this page shows only the API status above.
          </p>
        </EmptyState>
      </div>
    </>
  );
}
