import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet path={paths.mileage}>
      The van’s trip log will live here: odometer readings, the purpose of each trip and the deduction for the
      tax year.
    </NotBuiltYet>
  );
}
