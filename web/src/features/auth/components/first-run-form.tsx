import { useState, type FormEvent } from 'react';
import { firstRunSchema } from '@shared/schemas/plant-setup';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { issuesToFieldErrors, serverFieldErrors, formMessage, type FieldErrors } from '../../../lib/form';
import { useCreateFirstAdmin, useFirstRunNeeded } from '../api/first-run';

/** The first admin of a new site, from the one-time link `npm start` printed. */
export function FirstRunForm({ token, onDone }: { token: string; onDone: () => void }) {
  const needed = useFirstRunNeeded();
  const create = useCreateFirstAdmin();
  const [values, setValues] = useState({ name: '', email: '', password: '' });
  const [errors, setErrors] = useState<FieldErrors>({});
  const server = serverFieldErrors(create.error);
  const set = (k: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [k]: e.target.value }));

  if (needed.data && !needed.data.needed) {
    return <FormError>This Ferrisight already has users: sign in instead, or ask an admin for an account.</FormError>;
  }
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = firstRunSchema.safeParse({ ...values, token });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    create.mutate(parsed.data, { onSuccess: onDone });
  };
  return (
    <form onSubmit={submit} noValidate aria-label="Create the first admin" className="flex flex-col gap-4">
      <FormError>{errors.token ?? formMessage(create.error)}</FormError>
      <TextField label="Your name" value={values.name} onChange={set('name')} error={errors.name ?? server.name} autoComplete="name" />
      <TextField label="E-mail" type="email" value={values.email} onChange={set('email')} error={errors.email ?? server.email} autoComplete="email" />
      <TextField label="Password" type="password" value={values.password} onChange={set('password')} error={errors.password ?? server.password}
        hint="At least 8 characters; a long passphrase is best" autoComplete="new-password" />
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={create.isPending}>{create.isPending ? 'Creating…' : 'Create admin and sign in'}</Button>
      </div>
    </form>
  );
}
