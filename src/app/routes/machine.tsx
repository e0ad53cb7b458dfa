import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return <NotBuiltYet path={paths.customers}>One machine: its specifications and full service history.</NotBuiltYet>;
}
