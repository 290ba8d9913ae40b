import { useState, type FormEvent } from 'react';
import { createUserSchema, type Role } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useCreateUser } from '../api/create-user';
import { ROLE_OPTIONS } from './role-labels';

const EMPTY = { email: '', name: '', role: 'operator' as Role, password: '' };

export function CreateUserForm({ onDone }: { onDone: () => void }) {
  const [values, setValues] = useState(EMPTY);
  const [errors, setErrors] = useState<FieldErrors>({});
  const create = useCreateUser();
  const taken = create.error instanceof ApiError && create.error.status === 409;
  const server: FieldErrors = { ...serverFieldErrors(create.error), ...(taken ? { email: 'A user with this e-mail already exists' } : {}) };
  const set = (k: keyof typeof EMPTY) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [k]: e.target.value }));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = createUserSchema.safeParse(values);
    if (!parsed.success) {
      setErrors(issuesToFieldErrors(parsed.error.issues));
      return;
    }
    setErrors({});
    create.mutate(parsed.data, { onSuccess: onDone });
  };

  return (
    <form onSubmit={submit} noValidate aria-label="Add user" className="flex flex-col gap-4">
      <h3 className="font-bold">Add user</h3>
      {!taken && <FormError>{formMessage(create.error)}</FormError>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" value={values.name} onChange={set('name')} error={errors.name ?? server.name} autoComplete="off" />
        <TextField label="E-mail" type="email" value={values.email} onChange={set('email')} error={errors.email ?? server.email} autoComplete="off" />
        <SelectField label="Role" value={values.role} onChange={set('role')} options={ROLE_OPTIONS} error={errors.role ?? server.role} />
        <TextField
          label="First password"
          type="password"
          value={values.password}
          onChange={set('password')}
          error={errors.password ?? server.password}
          hint="At least 8 characters. Give it to the person by a separate channel; they change it after signing in."
          autoComplete="new-password"
        />
      </div>
      <div className="flex justify-end gap-3">
        <Button onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={create.isPending}>
          {create.isPending ? 'Adding…' : 'Add user'}
        </Button>
      </div>
    </form>
  );
}
