import { PROCEDURE_KEYS, PROCEDURES, type ProcedureKey } from '../../../shared/procedures/index';

/** The checks the dashboard offers to start, in the order the trade runs them. */
export const STARTABLE = PROCEDURE_KEYS.map((key) => ({
  key,
  title: PROCEDURES[key].title,
  summary: PROCEDURES[key].summary,
}));

export function isProcedureKey(name: string | null): name is ProcedureKey {
  return name !== null && (PROCEDURE_KEYS as readonly string[]).includes(name);
}

/** Where a new run of `procedure` on the job starts (`runId` "new", then replaced by the real one). */
export function newRunSearch(procedure: ProcedureKey): string {
  return `?${new URLSearchParams({ procedure })}`;
}
