import { useState, type FormEvent } from 'react';
import { reasonSchema } from '@shared/schemas/plant-setup';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formMessage } from '../../../lib/form';

type Props = {
  label: string;
  /** The question shown above the reason field. */
  prompt: string;
  confirm: string;
  danger?: boolean;
  pending: boolean;
  error: unknown;
  onConfirm: (reason: string, done: () => void) => void;
};

/** A button that asks for a reason before it acts (retire, disable, new password). */
export function ReasonAction({ label, prompt, confirm, danger, pending, error, onConfirm }: Props) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [invalid, setInvalid] = useState<string>();
  if (!open) return <Button size="sm" variant="ghost" onClick={() => setOpen(true)}>{label}</Button>;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = reasonSchema.safeParse(reason);
    if (!parsed.success) return setInvalid(parsed.error.issues[0]?.message);
    setInvalid(undefined);
    onConfirm(parsed.data, () => {
      setOpen(false);
      setReason('');
    });
  };
  return (
    <form onSubmit={submit} noValidate aria-label={label} className="mt-2 flex w-full flex-col gap-2 rounded-md border border-line-strong bg-panel-2 p-3">
      <FormError>{formMessage(error)}</FormError>
      <TextField label={prompt} value={reason} onChange={(e) => setReason(e.target.value)} error={invalid} autoComplete="off" />
      <div className="flex justify-end gap-2">
        <Button size="sm" onClick={() => setOpen(false)}>Cancel</Button>
        <Button size="sm" type="submit" variant={danger ? 'danger' : 'primary'} disabled={pending}>{confirm}</Button>
      </div>
    </form>
  );
}
