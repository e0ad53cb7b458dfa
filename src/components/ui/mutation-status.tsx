import { errorText } from '../../lib/error-text';
import { toneClasses, toneGlyphs } from './tone';

export type MutationLike = { isPending: boolean; isSuccess: boolean; error: Error | null };

type MutationStatusProps = {
  /** A `useMutation` result, as it is. */
  mutation: MutationLike;
  /** What finished, e.g. "Specs saved." */
  success: string;
  /** What is under way, e.g. "Saving the specs…"; left out, nothing shows while pending. */
  pending?: string;
  /** The failure's opening words, e.g. "The specs were not saved."; the reason follows. */
  failure?: string;
};

/**
 * The outcome of a write, beside the button that started it: pending and success are announced
 * politely, a failure at once; each is marked by shape as well as colour.
 */
export function MutationStatus({
  mutation,
  success,
  pending,
  failure = 'That did not work.',
}: MutationStatusProps) {
  if (mutation.error) {
    return (
      <p
        role="alert"
        className={`flex gap-2 rounded-plate border-2 px-4 py-3 text-base font-bold ${toneClasses.fail}`}
      >
        <span aria-hidden="true">{toneGlyphs.fail}</span>
        <span>
          {failure} {errorText(mutation.error)}
        </span>
      </p>
    );
  }
  return (
    <p role="status" className="min-h-6 text-base font-bold">
      {mutation.isPending && pending ? <span className="text-ink-soft">{pending}</span> : null}
      {mutation.isSuccess ? (
        <span className="flex gap-2 text-pass">
          <span aria-hidden="true">{toneGlyphs.pass}</span>
          {success}
        </span>
      ) : null}
    </p>
  );
}
