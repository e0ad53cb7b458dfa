import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return <NotBuiltYet path={paths.jobs}>A guided check, step by step.</NotBuiltYet>;
}
