import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet path={paths.reminders}>
      Machines coming due for service will live here, with the reminders sent to their owners.
    </NotBuiltYet>
  );
}
