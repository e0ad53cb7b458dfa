import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Settings">
      Business details, rates and who may sign in will be set here.
    </NotBuiltYet>
  );
}
