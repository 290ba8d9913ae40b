import { useState } from 'react';
import { roleSchema, type UserRow as User } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { useUpdateUser } from '../api/update-user';
import { ROLE_OPTIONS } from './role-labels';

export function UserRow({ user, isSelf }: { user: User; isSelf: boolean }) {
  const update = useUpdateUser();
  const [confirming, setConfirming] = useState(false);

  return (
    <tr className={`border-t border-line ${user.disabled ? 'text-ink-muted' : ''}`}>
      <td className="px-3 py-2 font-semibold">
        {user.name}
        {isSelf && <span className="ml-1 font-normal text-ink-muted">(you)</span>}
      </td>
      <td className="px-3 py-2">{user.email}</td>
      <td className="px-3 py-2">
        <label className="sr-only" htmlFor={`role-${user.id}`}>
          Role of {user.name}
        </label>
        <select
          id={`role-${user.id}`}
          value={user.role}
          disabled={isSelf || update.isPending}
          title={isSelf ? 'You cannot change your own role' : undefined}
          onChange={(e) => {
            const role = roleSchema.safeParse(e.target.value);
            if (role.success) update.mutate({ id: user.id, changes: { role: role.data } });
          }}
          className="h-8 rounded-md border border-line-strong bg-panel px-2 text-sm text-ink"
        >
          {ROLE_OPTIONS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </td>
      <td className="px-3 py-2">{user.disabled ? <span className="font-semibold">Disabled</span> : 'Active'}</td>
      <td className="px-3 py-2 text-right">
        {update.isError && (
          <span role="alert" className="mr-2 text-sm text-attention-1-ink">
            {update.error.message}
          </span>
        )}
        {isSelf ? null : user.disabled ? (
          <Button size="sm" disabled={update.isPending} onClick={() => update.mutate({ id: user.id, changes: { disabled: false } })}>
            Enable
          </Button>
        ) : confirming ? (
          <span className="inline-flex items-center gap-2">
            <span className="text-sm">Disable and sign out {user.name}?</span>
            <Button size="sm" onClick={() => setConfirming(false)}>
              Keep
            </Button>
            <Button
              size="sm"
              variant="danger"
              disabled={update.isPending}
              onClick={() => update.mutate({ id: user.id, changes: { disabled: true } }, { onSettled: () => setConfirming(false) })}
            >
              Disable
            </Button>
          </span>
        ) : (
          <Button size="sm" onClick={() => setConfirming(true)}>
            Disable…
          </Button>
        )}
      </td>
    </tr>
  );
}
