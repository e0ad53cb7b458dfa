import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet
      path={paths.invoices}
      forCustomer="Your invoices will live here: what was billed, what you have paid and a way to pay the rest."
    >
      Estimates and invoices will live here: line items, payments taken and what is still owed.
    </NotBuiltYet>
  );
}
