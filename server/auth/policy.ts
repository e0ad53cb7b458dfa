/** The policy table lives in shared/ so the dashboard offers exactly what the server allows. */
export { POLICY, isAllowed, type Action, type Resource } from '../../shared/api/policy';
