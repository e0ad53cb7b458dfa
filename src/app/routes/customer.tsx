import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return <NotBuiltYet path={paths.customers}>One customer: contact details, machines and service history.</NotBuiltYet>;
}
