import { NotBuiltYet } from '../layout/not-built-yet';

export function Component() {
  return (
    <NotBuiltYet section="Invoices">
      Estimates and invoices will live here: line items, payments taken and what is still owed.
    </NotBuiltYet>
  );
}
