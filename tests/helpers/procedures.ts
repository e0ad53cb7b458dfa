import { answerStep, startRun, walkRun, type RunState, type RunView } from '../../shared/procedures/engine';
import type { MachineSpec } from '../../shared/procedures/specs';
import type { ProcedureDefinition } from '../../shared/procedures/types';

/**
 * Walks a procedure with the answer given for each step it reaches, acknowledging every caution
 * as the mechanic would; fails loudly when the walk reaches a step the test has no answer for.
 */
export function walkWith(
  procedure: ProcedureDefinition,
  answers: Record<string, unknown>,
  spec?: MachineSpec,
): RunView {
  let state: RunState = startRun(procedure);
  for (;;) {
    const view = walkRun(procedure, state, { spec });
    if (!view.current) return view;
    const key = view.current.key;
    if (!(key in answers)) throw new Error(`the walk reached ${key}, which the test gave no answer for`);
    const result = answerStep(
      procedure,
      state,
      { stepKey: key, answer: answers[key], cautionAcknowledged: true },
      { spec },
    );
    if (!result.ok) throw new Error(`${key}: ${result.error}`);
    state = result.state;
  }
}
