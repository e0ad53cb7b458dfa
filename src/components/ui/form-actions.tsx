import { Button } from './button';
import { MutationStatus, type MutationLike } from './mutation-status';

type FormActionsProps = {
  /** The form's `useMutation` result. */
  mutation: MutationLike;
  /** The save button's words, e.g. "Add the customer". */
  submit: string;
  onCancel: () => void;
  /** What MutationStatus says while saving, once saved, and before the reason on a failure. */
  pending: string;
  success: string;
  failure: string;
};

/**
 * A form's save and cancel, with the save's outcome beneath them: both buttons held while it
 * saves, so a second press cannot send it twice.
 */
export function FormActions({ mutation, submit, onCancel, pending, success, failure }: FormActionsProps) {
  return (
    <div className="grid gap-3">
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : submit}
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={mutation.isPending}>
          Cancel
        </Button>
      </div>
      <MutationStatus mutation={mutation} pending={pending} success={success} failure={failure} />
    </div>
  );
}
