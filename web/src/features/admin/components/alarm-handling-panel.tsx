import { useState, type FormEvent } from 'react';
import { updateSettingSchema, type SiteSettingKey } from '@shared/schemas/workbench';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { Panel } from '../../../components/ui/panel';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useSiteSettings } from '../api/get-site-settings';
import { useUpdateSiteSetting } from '../api/update-site-setting';

const WHO = [
  { value: '0', label: 'Supervisors, engineers and admins' },
  { value: '1', label: 'Operators too' },
];
const LONGEST = [1, 2, 4, 8, 12].map((h) => ({ value: String(h), label: `${h} h` }));

type SiteRow = { siteId: number; siteTag: string; operatorsMayShelve: number; maxShelveHours: number };

function SiteShelveForm({ site }: { site: SiteRow }) {
  const update = useUpdateSiteSetting();
  const [who, setWho] = useState(String(site.operatorsMayShelve));
  const [longest, setLongest] = useState(String(site.maxShelveHours));
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [saved, setSaved] = useState(false);
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setSaved(false);
    const changes: Array<[SiteSettingKey, number]> = [];
    if (Number(who) !== site.operatorsMayShelve) changes.push(['operatorsMayShelve', Number(who)]);
    if (Number(longest) !== site.maxShelveHours) changes.push(['maxShelveHours', Number(longest)]);
    if (changes.length === 0) return setErrors({ reason: 'Nothing has changed' });
    const inputs = changes.map(([key, value]) => updateSettingSchema.safeParse({ siteId: site.siteId, key, value, reason }));
    const bad = inputs.find((p) => !p.success);
    if (bad && !bad.success) return setErrors(issuesToFieldErrors(bad.error.issues));
    setErrors({});
    for (const p of inputs) if (p.success) await update.mutateAsync(p.data).catch(() => undefined);
    setReason('');
    setSaved(true);
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label={`Shelving at ${site.siteTag}`}>
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="Who may shelve alarms" value={who} onChange={(e) => setWho(e.target.value)} options={WHO} />
        <SelectField label="Longest shelve" value={longest} onChange={(e) => setLongest(e.target.value)} options={LONGEST}
          hint="A shelved alarm comes back on its own when its time runs out." />
      </div>
      <TextField label="Reason for the change" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} error={errors.reason ?? serverFieldErrors(update.error).reason} />
      <FormError>{formMessage(update.error)}</FormError>
      {saved && !update.isError && <Notice tone="info">Saved. The reason is in the audit trail.</Notice>}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={update.isPending}>Save</Button>
      </div>
    </form>
  );
}

/** Site rules for alarm handling an admin sets: who may shelve and for how long (operators always acknowledge). */
export function AlarmHandlingPanel() {
  const q = useSiteSettings();
  return (
    <Panel title="Alarm handling">
      <p className="mb-3 text-sm text-ink-muted">Everyone on shift may acknowledge. Shelving hides an alarm for a while, so the site decides who may do it.</p>
      {q.isError && <p role="alert" className="text-sm text-attention-1-ink">{q.error.message}</p>}
      {q.data?.map((s) => (
        <SiteShelveForm key={`${s.siteId}-${s.settings.operatorsMayShelve}-${s.settings.maxShelveHours}`}
          site={{ siteId: s.siteId, siteTag: s.siteTag, operatorsMayShelve: s.settings.operatorsMayShelve, maxShelveHours: s.settings.maxShelveHours }} />
      ))}
    </Panel>
  );
}
