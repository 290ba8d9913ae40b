import { useState, type FormEvent } from 'react';
import { applyTemplateSchema } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { issuesByPath, serverErrorsByPath, unplacedMessage, type FieldErrors } from '../../../lib/form';
import { useApplyTemplate } from '../api/apply-template';
import { useTemplates } from '../api/get-templates';
import type { Place } from './desk-types';

/** Gives tanks the alarms of a circuit template they lack; what a tank already has stays as it is. */
export function TemplateForm({ places, tankId }: { places: Place[]; tankId: number }) {
  const templates = useTemplates();
  const apply = useApplyTemplate();
  const [templateId, setTemplateId] = useState('');
  const [chosen, setChosen] = useState<number[]>([tankId]);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const server = serverErrorsByPath(apply.error);
  const list = templates.data ?? [];
  const template = list.find((t) => t.id === templateId) ?? list[0];
  const circuits = [...new Map(places.map((p) => [p.circuitId, p.circuitName])).entries()];
  const toggle = (id: number) => setChosen((c) => (c.includes(id) ? c.filter((x) => x !== id) : [...c, id]));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = applyTemplateSchema.safeParse({ templateId: template?.id ?? '', tankIds: chosen, reason });
    if (!parsed.success) return setErrors(issuesByPath(parsed.error.issues));
    setErrors({});
    apply.mutate(parsed.data, { onSuccess: () => setReason('') });
  };

  if (templates.isError) return <FormError>Templates could not be loaded: {templates.error.message}</FormError>;
  const tanksError = errors.tankIds ?? server.tankIds;
  return (
    <form onSubmit={submit} noValidate aria-label="Apply a circuit template" className="flex max-w-3xl flex-col gap-4">
      <p className="text-sm text-ink-muted">
        Creates the template's alarms, with starting limits and rationalisation, on the tanks that do not have them yet. Alarms a tank already has keep
        their settings.
      </p>
      <FormError>{unplacedMessage(apply.error, ['templateId', 'tankIds', 'reason'])}</FormError>
      <SelectField label="Template" value={template?.id ?? ''} onChange={(e) => setTemplateId(e.target.value)} error={errors.templateId ?? server.templateId}
        hint={template ? `${template.description}; ${template.definitions.length} alarms` : 'Loading…'}
        options={list.map((t) => ({ value: t.id, label: t.name }))} />
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-semibold">Tanks</legend>
        {circuits.map(([id, name]) => (
          <div key={id} className="flex flex-wrap items-center gap-x-4 gap-y-1">
            <span className="w-40 text-sm text-ink-muted">{name}</span>
            {places.filter((p) => p.circuitId === id).map((p) => (
              <label key={p.tankId} className="inline-flex items-center gap-1.5">
                <input type="checkbox" className="h-4 w-4" checked={chosen.includes(p.tankId)} onChange={() => toggle(p.tankId)} />
                <span className="font-semibold">{p.tankTag}</span>
              </label>
            ))}
          </div>
        ))}
        {tanksError && <p className="text-sm font-medium text-attention-1-ink"><span aria-hidden="true">✕ </span>{chosen.length ? tanksError : 'Pick at least one tank'}</p>}
      </fieldset>
      <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason ?? server.reason} maxLength={500}
        hint="Kept in the change record, e.g. new tanks commissioned." />
      {apply.data && (
        <Notice>
          {apply.data.created.length
            ? `${apply.data.created.length} alarm definition${apply.data.created.length === 1 ? '' : 's'} created.`
            : 'Nothing to create: the chosen tanks already have every alarm of this template.'}
        </Notice>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={apply.isPending || !template}>
          {apply.isPending ? 'Applying…' : `Apply to ${chosen.length} tank${chosen.length === 1 ? '' : 's'}`}
        </Button>
      </div>
    </form>
  );
}
