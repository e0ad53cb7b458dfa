import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Mileage">
      The van’s trip log will live here: odometer readings, the purpose of each trip and the deduction for the
      tax year.
    </NotBuiltYet>
  );
}
