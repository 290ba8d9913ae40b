import { useState, type FormEvent } from 'react';
import type { z } from 'zod';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { issuesByPath, serverErrorsByPath, unplacedMessage, type FieldErrors } from '../../../lib/form';
import type { PartKind } from '../api/plant-setup-keys';
import { useSavePart } from '../api/save-part';

export type FieldSpec = {
  name: string;
  label: string;
  type?: 'text' | 'number' | 'select' | 'datetime-local';
  options?: ReadonlyArray<{ value: string; label: string }>;
  unit?: string;
  hint?: string;
  /** Only shown when this returns true for the current values. */
  when?: (values: Record<string, string>) => boolean;
};

/** Form text → what the shared schema parses: empty optional fields left out, local date-times as ISO. */
function toInput(fields: FieldSpec[], values: Record<string, string>, fixed: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...fixed };
  for (const f of fields) {
    const v = (values[f.name] ?? '').trim();
    if (v === '' || (f.when && !f.when(values))) continue;
    out[f.name] = f.type === 'datetime-local' && !Number.isNaN(Date.parse(v)) ? new Date(v).toISOString() : v;
  }
  return out;
}

type Props = {
  title: string;
  kind: PartKind;
  /** null: create; otherwise the part being edited (a reason is then required). */
  id: number | null;
  fields: FieldSpec[];
  initial: Record<string, string>;
  /** Values the person does not type (e.g. the site a circuit belongs to). */
  fixed?: Record<string, unknown>;
  schema: z.ZodType;
  onDone: (saved?: Record<string, unknown>) => void;
};

/** Labels above fields, errors under them in words, primary action bottom right. */
export function PartForm({ title, kind, id, fields, initial, fixed = {}, schema, onDone }: Props) {
  const [values, setValues] = useState<Record<string, string>>({ reason: '', ...initial });
  const [errors, setErrors] = useState<FieldErrors>({});
  const save = useSavePart(kind, id);
  const server = serverErrorsByPath(save.error);
  const all = [...fields, { name: 'reason', label: id === null ? 'Note (optional)' : 'Reason for the change', hint: 'Kept in the audit trail' }];
  const shown = all.filter((f) => !f.when || f.when(values));
  const set = (name: string) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value }));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = schema.safeParse(toInput(all, values, fixed));
    if (!parsed.success) {
      setErrors(issuesByPath(parsed.error.issues));
      return;
    }
    setErrors({});
    save.mutate(parsed.data as object, { onSuccess: (saved) => onDone(saved) });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={title} className="flex flex-col gap-4 rounded-md border border-line-strong bg-panel-2 p-4">
      <h3 className="font-bold">{title}</h3>
      <FormError>{unplacedMessage(save.error, shown.map((f) => f.name))}</FormError>
      <div className="grid gap-4 sm:grid-cols-2">
        {shown.map((f) => {
          const common = { label: f.label, value: values[f.name] ?? '', onChange: set(f.name), error: errors[f.name] ?? server[f.name], hint: f.hint };
          return f.type === 'select'
            ? <SelectField key={f.name} {...common} options={f.options ?? []} />
            : <TextField key={f.name} {...common} type={f.type === 'number' ? 'text' : f.type ?? 'text'} inputMode={f.type === 'number' ? 'decimal' : undefined} unit={f.unit} autoComplete="off" />;
        })}
      </div>
      <div className="flex justify-end gap-3">
        <Button onClick={() => onDone()}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={save.isPending}>
          {save.isPending ? 'Saving…' : id === null ? 'Add' : 'Save'}
        </Button>
      </div>
    </form>
  );
}
