import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet
      path={paths.customers}
      forCustomer="Your machines will live here: each one’s service history, the checks run on it and when it is next due."
    >
      Customers and their machines will live here: contact details, VIN, odometer or engine hours, and the
      specifications from each service manual.
    </NotBuiltYet>
  );
}
