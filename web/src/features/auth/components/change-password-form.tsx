import { useState, type FormEvent } from 'react';
import { changePasswordSchema } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useChangePassword } from '../api/change-password';

/** After a change the server ends the session; onChanged sends the user to sign in again. */
export function ChangePasswordForm({ onChanged, onCancel }: { onChanged: () => void; onCancel: () => void }) {
  const [currentPassword, setCurrent] = useState('');
  const [newPassword, setNew] = useState('');
  const [repeat, setRepeat] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const change = useChangePassword();
  const server = serverFieldErrors(change.error);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = changePasswordSchema.safeParse({ currentPassword, newPassword });
    const next = parsed.success ? {} : issuesToFieldErrors(parsed.error.issues);
    if (!next.newPassword && newPassword !== repeat) next.repeat = 'The two new passwords differ';
    setErrors(next);
    if (!parsed.success || next.repeat) return;
    change.mutate(parsed.data, { onSuccess: onChanged });
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Change password">
      <FormError>{formMessage(change.error)}</FormError>
      <TextField
        label="Current password"
        type="password"
        autoComplete="current-password"
        value={currentPassword}
        onChange={(e) => setCurrent(e.target.value)}
        error={errors.currentPassword ?? server.currentPassword}
      />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        value={newPassword}
        onChange={(e) => setNew(e.target.value)}
        error={errors.newPassword ?? server.newPassword}
        hint="At least 8 characters; a long passphrase is welcome."
      />
      <TextField
        label="New password again"
        type="password"
        autoComplete="new-password"
        value={repeat}
        onChange={(e) => setRepeat(e.target.value)}
        error={errors.repeat}
      />
      <p className="text-sm text-ink-muted">Changing the password signs you out everywhere, including this screen.</p>
      <div className="flex justify-end gap-3 pt-2">
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={change.isPending}>
          {change.isPending ? 'Changing…' : 'Change password'}
        </Button>
      </div>
    </form>
  );
}
