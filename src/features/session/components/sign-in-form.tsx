import { useState } from 'react';
import type { FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/text-field';
import { toneClasses, toneGlyphs } from '../../../components/ui/tone';
import { useSignIn } from '../api/mutations';
import { signInErrorMessage } from './sign-in-errors';

/**
 * E-mail and password. On success the session query learns who signed in, and the page around
 * the form moves on from there; this form only asks and reports.
 */
export function SignInForm() {
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    signIn.mutate(
      { email: email.trim(), password },
      // A refused password is not kept in the field to be resubmitted by a second tap.
      { onError: () => setPassword('') },
    );
  }

  return (
    <form onSubmit={submit} className="grid gap-4" aria-label="Sign in">
      <TextField
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        inputMode="email"
        required
        value={email}
        onChange={(event) => setEmail(event.target.value)}
      />
      <TextField
        label="Password"
        type="password"
        name="password"
        autoComplete="current-password"
        required
        value={password}
        onChange={(event) => setPassword(event.target.value)}
      />
      {signIn.error ? (
        <p
          role="alert"
          className={`flex gap-2 rounded-plate border-2 px-4 py-3 text-base font-bold ${toneClasses.fail}`}
        >
          <span aria-hidden="true">{toneGlyphs.fail}</span>
          <span>{signInErrorMessage(signIn.error)}</span>
        </p>
      ) : null}
      <Button type="submit" disabled={signIn.isPending} className="w-full text-lg">
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
