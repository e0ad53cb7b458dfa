import { NotBuiltYet } from '../layout/not-built-yet';
import { paths } from '../paths';

export function Component() {
  return <NotBuiltYet path={paths.jobs}>One job: its complaint, readings, checks, line items and attachments.</NotBuiltYet>;
}
