import { useState, type FormEvent } from 'react';
import { signInSchema, type SessionUser } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { issuesToFieldErrors, type FieldErrors } from '../../../lib/form';
import { useSignIn } from '../api/sign-in';

function messageFor(error: unknown): string | null {
  if (!error) return null;
  if (error instanceof ApiError) {
    if (error.status === 429) {
      const min = Math.max(1, Math.ceil((error.retryAfterS ?? 60) / 60));
      return `Too many attempts, try again in ${min} min.`;
    }
    if (error.status === 401) return error.detail || 'E-mail or password is wrong.';
    if (error.status === 0) return error.detail;
    if (error.errors.length > 0) return null;
    return error.detail || error.title;
  }
  return 'Sign-in failed. Try again.';
}

export function SignInForm({ onSignedIn }: { onSignedIn: (user: SessionUser) => void }) {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const signIn = useSignIn();
  const serverFields = signIn.error instanceof ApiError ? signIn.error.fieldErrors() : {};

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = signInSchema.safeParse({ email, password });
    if (!parsed.success) {
      setFieldErrors(issuesToFieldErrors(parsed.error.issues));
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, { onSuccess: onSignedIn });
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <FormError>{messageFor(signIn.error)}</FormError>
      <TextField
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={fieldErrors.email ?? serverFields.email}
        required
      />
      <TextField
        label="Password"
        type="password"
        name="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={fieldErrors.password ?? serverFields.password}
        required
      />
      <div className="flex justify-end pt-2">
        <Button type="submit" variant="primary" disabled={signIn.isPending}>
          {signIn.isPending ? 'Signing in…' : 'Sign in'}
        </Button>
      </div>
    </form>
  );
}
