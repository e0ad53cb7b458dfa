import type { Verdict } from '../../../../shared/api/readings';
import { StatusPill } from '../../../components/ui/status-pill';

const VERDICT_WORDS: Record<Verdict, string> = { pass: 'Pass', warn: 'Warn', fail: 'Fail' };

export function verdictWord(verdict: Verdict): string {
  return VERDICT_WORDS[verdict];
}

/** A verdict as colour, shape and word together, never colour alone. */
export function VerdictPill({ verdict }: { verdict: Verdict | null }) {
  return verdict ? (
    <StatusPill tone={verdict}>{VERDICT_WORDS[verdict]}</StatusPill>
  ) : (
    <StatusPill tone="quiet">No verdict</StatusPill>
  );
}
