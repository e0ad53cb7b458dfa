import { useEffect, useId, useMemo, useRef, useState } from 'react';
import type { FormEvent } from 'react';
import type { StepAnswerInput } from '../../../../shared/api/checks';
import type { RunState } from '../../../../shared/procedures/engine';
import type { MachineSpec } from '../../../../shared/procedures/specs';
import type { ProcedureDefinition, SeriesValue, StepDefinition } from '../../../../shared/procedures/types';
import { Button } from '../../../components/ui/button';
import { toneGlyphs } from '../../../components/ui/tone';
import { judgeDraft, shownFields, type Draft, type Judgement } from '../walk';
import { CautionBlock } from './caution-block';
import { FieldInput } from './field-input';
import { PressureHold } from './pressure-hold';
import { VerdictPill } from './verdict-pill';

export type StepFormProps = {
  /** The step's number in this run (answered steps + 1). */
  number: number;
  procedure: ProcedureDefinition;
  state: RunState;
  step: StepDefinition;
  /** As the server sent it for the current step: the deferral to the manual is its last line. */
  caution: { title: string; lines: readonly string[] } | null;
  spec: MachineSpec | null;
  initialDraft?: Draft;
  canGoBack: boolean;
  busy: 'saving' | 'backing' | 'pausing' | null;
  /** The last request's refusal or failure, in one line. */
  error: string | null;
  onSave: (input: StepAnswerInput, live: Judgement) => void;
  onBack: () => void;
  onPause: () => void;
};

/**
 * The current step as a form: what to do, its caution first (the readings stay locked until it is
 * acknowledged), the fields, and the verdict the shared engine reaches on the answer as typed.
 * Mounted afresh for every step, so focus moves to its heading and nothing carries over.
 */
export function StepForm(props: StepFormProps) {
  const { number, procedure, state, step, caution, spec, busy, error } = props;
  const headingId = useId();
  const heading = useRef<HTMLHeadingElement>(null);
  const [draft, setDraft] = useState<Draft>(() => props.initialDraft ?? {});
  const [acknowledged, setAcknowledged] = useState(false);
  const [tried, setTried] = useState(false);
  const unlocked = !caution || acknowledged;

  useEffect(() => {
    heading.current?.focus();
  }, []);

  const judgement = useMemo(
    () => judgeDraft(procedure, state, step, draft, spec),
    [procedure, state, step, draft, spec],
  );

  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    if (!unlocked || busy) return;
    if (judgement.state !== 'judged') {
      setTried(true);
      return;
    }
    props.onSave(
      { stepKey: step.key, answer: judgement.answer, cautionAcknowledged: Boolean(caution) },
      judgement,
    );
  };

  const change = (key: string, value: string | string[]) => setDraft((d) => ({ ...d, [key]: value }));

  return (
    <section
      aria-labelledby={headingId}
      className="grid gap-4 rounded-plate border-3 border-ink bg-panel p-5"
    >
      <div>
        <p className="text-base font-bold text-ink-soft">Step {number}</p>
        <h2 id={headingId} ref={heading} tabIndex={-1} className="text-2xl font-bold">
          {step.title}
        </h2>
        <p className="mt-2 max-w-prose text-lg">{step.prompt}</p>
      </div>
      {caution ? (
        <CautionBlock caution={caution} acknowledged={acknowledged} onAcknowledge={setAcknowledged} />
      ) : null}
      <form onSubmit={onSubmit} noValidate className="grid gap-4">
        <fieldset disabled={!unlocked} className="grid gap-5 disabled:opacity-60">
          <legend className="sr-only">The readings for {step.title}</legend>
          {unlocked ? null : (
            <p className="text-lg font-bold">Acknowledge the caution above to unlock the readings.</p>
          )}
          {shownFields(step, draft).map((field) => (
            <FieldInput key={field.key} field={field} draft={draft} onChange={change} />
          ))}
        </fieldset>
        {unlocked ? <LiveVerdict step={step} judgement={judgement} tried={tried} /> : null}
        {error ? (
          <p role="alert" className="text-lg font-bold text-fail">
            <span aria-hidden="true">{toneGlyphs.fail} </span>
            {error}
          </p>
        ) : null}
        <div className="flex flex-wrap gap-3">
          <Button type="submit" disabled={!unlocked || busy !== null}>
            {busy === 'saving' ? 'Saving…' : 'Save step'}
          </Button>
          <Button variant="secondary" onClick={props.onBack} disabled={!props.canGoBack || busy !== null}>
            {busy === 'backing' ? 'Going back…' : 'Back a step'}
          </Button>
          <Button variant="secondary" onClick={props.onPause} disabled={busy !== null}>
            {busy === 'pausing' ? 'Pausing…' : 'Pause, finish later'}
          </Button>
        </div>
      </form>
    </section>
  );
}

/** The engine's judgement of the answer as it stands, announced politely as it changes. */
function LiveVerdict({
  step,
  judgement,
  tried,
}: {
  step: StepDefinition;
  judgement: Judgement;
  tried: boolean;
}) {
  const series =
    judgement.state === 'judged' && step.evaluator === 'pressure-hold'
      ? (Object.values(judgement.answer).find((v) => typeof v === 'object' && v !== null && 'points' in v) as
          SeriesValue | undefined)
      : undefined;
  return (
    <div className="grid gap-2">
      <div aria-live="polite" className="rounded-plate border-2 border-dashed border-rule p-3 text-lg">
        {judgement.state === 'incomplete' ? (
          <p className={tried ? 'font-bold text-fail' : 'text-ink-soft'}>
            {judgement.errors.length > 0
              ? judgement.errors.join(' · ')
              : `Still to give: ${judgement.waitingFor.join(', ')}.`}
          </p>
        ) : judgement.state === 'refused' ? (
          <p className="font-bold text-fail">
            <span aria-hidden="true">{toneGlyphs.fail} </span>
            {judgement.error}
          </p>
        ) : (
          <div className="grid gap-1" data-testid="live-verdict">
            <p className="flex flex-wrap items-center gap-2">
              <span className="font-bold">Judged here as typed:</span>
              {judgement.evaluation ? (
                <VerdictPill verdict={judgement.evaluation.verdict} />
              ) : (
                <span>an observation, not judged</span>
              )}
            </p>
            {judgement.evaluation ? <p>{judgement.evaluation.reason}</p> : null}
            <p className="text-base text-ink-soft">
              {judgement.nextTitle
                ? `Next: ${sentence(judgement.nextTitle)}`
                : 'This answer finishes the check.'}{' '}
              Saving sends it to the server, which judges it again; its verdict is the one kept.
            </p>
          </div>
        )}
      </div>
      {series && judgement.state === 'judged' && judgement.evaluation ? (
        <PressureHold
          series={series}
          figures={judgement.evaluation.figures}
          title="Pressure so far, as typed"
        />
      ) : null}
    </div>
  );
}

/** A title as the end of a sentence: "Fuel filters." but "Can it run with the gauge fitted?" */
const sentence = (title: string) => (/[.?!]$/.test(title) ? title : `${title}.`);
