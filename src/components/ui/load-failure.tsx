import { errorText } from '../../lib/error-text';
import { AlertPanel } from './alert-panel';
import { Button } from './button';

type LoadFailureProps = {
  /** What could not be loaded: "The customers could not be loaded". */
  title: string;
  error: Error;
  onRetry: () => void;
  retrying: boolean;
};

/** A read that failed: what, why in plain words, and a retry, in place of the data. */
export function LoadFailure({ title, error, onRetry, retrying }: LoadFailureProps) {
  return (
    <AlertPanel title={title}>
      <p>{errorText(error)}</p>
      <Button className="mt-4" onClick={onRetry} disabled={retrying}>
        {retrying ? 'Trying again…' : 'Try again'}
      </Button>
    </AlertPanel>
  );
}

/** While a read is under way: a quiet line announced to screen readers. */
export function Loading({ children }: { children: string }) {
  return (
    <p role="status" aria-busy="true" className="text-lg text-ink-soft">
      {children}
    </p>
  );
}
