import { Navigate } from 'react-router';
import { useSessionUser } from '../../features/session/api/queries';
import { homePathFor } from '../layout/sections';

/** "/" is nobody's page: each role goes on to its own first section. */
export function Component() {
  const { role } = useSessionUser();
  return <Navigate to={homePathFor(role)} replace />;
}
