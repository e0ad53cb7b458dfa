import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return <NotBuiltYet path={paths.invoices}>One invoice: its PDF, payments and sending.</NotBuiltYet>;
}
