import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useUsers } from '../api/get-users';
import { CreateUserForm } from './create-user-form';
import { UserRow } from './user-row';

export function UsersPanel({ currentUserId }: { currentUserId: number }) {
  const users = useUsers();
  const [creating, setCreating] = useState(false);

  return (
    <Panel
      title="Users"
      actions={
        !creating && (
          <Button size="sm" onClick={() => setCreating(true)}>
            Add user…
          </Button>
        )
      }
    >
      {creating && (
        <div className="mb-4 rounded-md border border-line bg-panel-2 p-4">
          <CreateUserForm onDone={() => setCreating(false)} />
        </div>
      )}
      {users.isPending ? (
        <Loading label="Loading users…" />
      ) : users.isError ? (
        <ErrorState title="Users could not be loaded" detail={users.error.message} onRetry={() => users.refetch()} />
      ) : (
        <ul aria-label="Users" className="flex flex-col">
          {users.data.map((u) => (
            <UserRow key={u.id} user={u} isSelf={u.id === currentUserId} />
          ))}
        </ul>
      )}
    </Panel>
  );
}
