import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Jobs">
      Work orders from booking to paid will live here: the customer, the machine, the complaint, the readings
      taken and the checks run.
    </NotBuiltYet>
  );
}
