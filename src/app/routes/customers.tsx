import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Customers & machines">
      Customers and their machines will live here: contact details, VIN, odometer or engine hours, and the
      specifications from each service manual.
    </NotBuiltYet>
  );
}
