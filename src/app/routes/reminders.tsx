import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Reminders">
      Machines coming due for service will live here, with the reminders sent to their owners.
    </NotBuiltYet>
  );
}
