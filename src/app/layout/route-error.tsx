import { isRouteErrorResponse, useRouteError } from 'react-router';
import { Button } from '../../components/ui/button';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';

/**
 * Shown when a page throws or its code fails to load. The usual cause of the latter is a rebuilt
 * dashboard while this tab still points at the old files, which a reload fixes.
 */
export function RouteError() {
  const error = useRouteError();
  return (
    <div className="p-4">
      <PageHeading title="This page failed">Something went wrong while showing this page.</PageHeading>
      <Panel>
        <p className="text-lg">
          <span className="font-bold">Reason: </span>
          {describe(error)}
        </p>
        <Button className="mt-4" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
      </Panel>
    </div>
  );
}

function describe(error: unknown): string {
  if (isRouteErrorResponse(error)) return `${error.status} ${error.statusText}`;
  if (error instanceof Error) return error.message;
  return 'unknown error';
}
