import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet
      path={paths.jobs}
      forCustomer="The work done on your machines will live here: what was found, what was measured and what was fixed."
    >
      Work orders from booking to paid will live here: the customer, the machine, the complaint, the readings
      taken and the checks run.
    </NotBuiltYet>
  );
}
