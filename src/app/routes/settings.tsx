import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return (
    <NotBuiltYet path={paths.settings}>
      Business details, rates and who may sign in will be set here.
    </NotBuiltYet>
  );
}
