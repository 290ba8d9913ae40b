import { useState, type FormEvent } from 'react';
import { roleSchema, updateUserSchema, type Role, type UserRow as User } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useUpdateUser } from '../api/update-user';
import { ROLE_LABELS, ROLE_OPTIONS } from './role-labels';

type Change = { role: Role } | { disabled: boolean };

function question(user: User, change: Change): string {
  if ('role' in change) return `Change ${user.name} from ${ROLE_LABELS[user.role]} to ${ROLE_LABELS[change.role]}? They are signed out at once.`;
  return change.disabled ? `Disable ${user.name}? They are signed out at once and cannot sign in.` : `Enable ${user.name} again?`;
}

/**
 * A role change or (dis)abling someone is never one click: the admin confirms it and gives a
 * reason, which the audit trail keeps with the before and after.
 */
function ConfirmChange({ user, change, onClose }: { user: User; change: Change; onClose: () => void }) {
  const update = useUpdateUser();
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = updateUserSchema.safeParse({ ...change, reason });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    update.mutate({ id: user.id, changes: parsed.data }, { onSuccess: onClose });
  };
  const destructive = 'role' in change || change.disabled;
  return (
    <form onSubmit={submit} className="flex flex-col gap-2 rounded-md border border-line-strong bg-panel-2 p-3" aria-label={`Confirm change for ${user.name}`} data-testid="confirm-user-change">
      <p className="font-semibold">{question(user, change)}</p>
      <TextField label="Reason (kept in the audit trail)" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500}
        error={errors.reason ?? serverFieldErrors(update.error).reason} />
      <FormError>{formMessage(update.error)}</FormError>
      <div className="flex flex-wrap justify-end gap-2">
        <Button variant="ghost" onClick={onClose}>Cancel</Button>
        <Button type="submit" variant={destructive ? 'danger' : 'primary'} disabled={update.isPending}>
          {'role' in change ? 'Change role' : change.disabled ? 'Disable' : 'Enable'}
        </Button>
      </div>
    </form>
  );
}

export function UserRow({ user, isSelf }: { user: User; isSelf: boolean }) {
  const [change, setChange] = useState<Change | null>(null);
  const pendingRole = change && 'role' in change ? change.role : user.role;

  return (
    <li className={`flex flex-col gap-2 border-t border-line py-3 ${user.disabled ? 'text-ink-muted' : ''}`} data-testid="user-row" data-email={user.email}>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <div className="min-w-0 flex-1 basis-56">
          <div className="font-semibold">
            {user.name}
            {isSelf && <span className="ml-1 font-normal text-ink-muted">(you)</span>}
          </div>
          <div className="truncate text-sm">{user.email}</div>
        </div>
        <div>
          <label className="sr-only" htmlFor={`role-${user.id}`}>Role of {user.name}</label>
          <select
            id={`role-${user.id}`}
            value={pendingRole}
            disabled={isSelf || user.disabled}
            title={isSelf ? 'You cannot change your own role' : undefined}
            onChange={(e) => {
              const role = roleSchema.safeParse(e.target.value);
              if (role.success) setChange(role.data === user.role ? null : { role: role.data });
            }}
            className="h-8 rounded-md border border-line-strong bg-panel px-2 text-sm text-ink"
          >
            {ROLE_OPTIONS.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
          </select>
        </div>
        <div className="w-20 text-sm">{user.disabled ? <span className="font-semibold">Disabled</span> : 'Active'}</div>
        <div className="ml-auto">
          {!isSelf && !change && (
            <Button size="sm" onClick={() => setChange({ disabled: !user.disabled })}>{user.disabled ? 'Enable…' : 'Disable…'}</Button>
          )}
        </div>
      </div>
      {change && <ConfirmChange key={JSON.stringify(change)} user={user} change={change} onClose={() => setChange(null)} />}
    </li>
  );
}
