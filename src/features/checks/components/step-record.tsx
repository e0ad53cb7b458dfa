import type { CheckStep } from '../../../../shared/api/checks';
import type { ProcedureDefinition, SeriesValue } from '../../../../shared/procedures/types';
import { describeAnswer } from '../walk';
import { PressureHold } from './pressure-hold';
import { VerdictPill } from './verdict-pill';

/** The series of a pressure-hold step, when it has one to draw. */
function holdSeries(procedure: ProcedureDefinition | null, step: CheckStep): SeriesValue | null {
  const definition = procedure?.steps[step.stepKey];
  if (!definition || definition.evaluator !== 'pressure-hold') return null;
  const field = definition.fields.find((f) => f.type === 'series');
  const value = field ? step.answer[field.key] : undefined;
  return value && typeof value === 'object' && Array.isArray((value as SeriesValue).points)
    ? (value as SeriesValue)
    : null;
}

/** One answered step as the server recorded it: what was given, and the verdict it derived. */
export function StepRecord({
  step,
  procedure,
  headingLevel = 3,
}: {
  step: CheckStep;
  procedure: ProcedureDefinition | null;
  headingLevel?: 3 | 4;
}) {
  const definition = procedure?.steps[step.stepKey];
  const answered = describeAnswer(definition, step.answer);
  const series = holdSeries(procedure, step);
  const Heading = headingLevel === 3 ? 'h3' : 'h4';
  const raised = step.findings.map((key) => procedure?.findings[key]?.title ?? key);
  return (
    <article className="grid gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Heading className="text-lg font-bold">
          {step.seq + 1}. {step.title}
        </Heading>
        <VerdictPill verdict={step.evaluation?.verdict ?? null} />
      </div>
      {answered.length > 0 ? (
        <dl className="grid gap-x-4 gap-y-1 text-base sm:grid-cols-[max-content_1fr]">
          {answered.map((item) => (
            <div key={item.label} className="contents">
              <dt className="font-bold">{item.label}</dt>
              <dd className="tabular-nums">{item.text}</dd>
            </div>
          ))}
        </dl>
      ) : null}
      {step.evaluation ? (
        <p className="text-base">{step.evaluation.reason}</p>
      ) : (
        <p className="text-base text-ink-soft">An observation: it steers the check, it is not judged.</p>
      )}
      {step.cautionAcknowledged ? (
        <p className="text-sm text-ink-soft">Caution acknowledged before the step.</p>
      ) : null}
      {raised.length > 0 ? <p className="text-base font-bold">Raised: {raised.join('; ')}</p> : null}
      {series && step.evaluation ? <PressureHold series={series} figures={step.evaluation.figures} /> : null}
    </article>
  );
}
