import { useState } from 'react';
import type { ShiftLogEntryView } from '@shared/schemas/shifts';
import { Button } from '../../../components/ui/button';
import { TextAreaField } from '../../../components/ui/field';
import { formatDateTime } from '../../../lib/format';
import { formMessage } from '../../../lib/form';
import { useEditEntry } from '../api/edit-entry';

type Props = { entry: ShiftLogEntryView; timeZone: string; mine: boolean; open: boolean; onCorrect: (e: ShiftLogEntryView) => void };

/**
 * One entry. Its author may reword it until the handover; after that, and for everyone else,
 * the only way to change the record is a correction appended to the log.
 */
export function EntryItem({ entry, timeZone, mine, open, onCorrect }: Props) {
  const edit = useEditEntry();
  const [draft, setDraft] = useState<string | null>(null);
  return (
    <li className="border-b border-line py-2" data-testid="log-entry">
      <div className="flex flex-wrap items-baseline gap-x-3 text-sm text-ink-muted">
        <span className="tabular-nums">{formatDateTime(entry.at, timeZone)}</span>
        <span className="font-semibold text-ink">{entry.author.name}</span>
        {entry.tank && <span className="rounded border border-line-strong px-1.5 text-xs font-bold text-ink">{entry.tank.tag}</span>}
        {entry.alarmId && <span className="text-xs">alarm #{entry.alarmId}</span>}
        <span className="text-xs">#{entry.id}</span>
        {entry.editedAt && <span className="text-xs">(reworded)</span>}
      </div>
      {draft === null ? (
        <p className="mt-1 whitespace-pre-wrap">
          {entry.correctsId && <span className="mr-1 font-semibold">Correction of #{entry.correctsId}:</span>}
          {entry.body}
        </p>
      ) : (
        <div className="mt-2 flex flex-col gap-2">
          <TextAreaField label="Reword your entry" value={draft} onChange={(e) => setDraft(e.target.value)} maxLength={4000} error={formMessage(edit.error) ?? undefined} />
          <div className="flex justify-end gap-2">
            <Button size="sm" onClick={() => setDraft(null)}>Cancel</Button>
            <Button size="sm" variant="primary" disabled={!draft.trim() || edit.isPending}
              onClick={() => edit.mutate({ id: entry.id, body: draft }, { onSuccess: () => setDraft(null) })}>Save</Button>
          </div>
        </div>
      )}
      {draft === null && (
        <div className="mt-1 flex gap-2">
          {mine && open && <Button size="sm" variant="ghost" onClick={() => setDraft(entry.body)}>Reword</Button>}
          <Button size="sm" variant="ghost" onClick={() => onCorrect(entry)}>Correct</Button>
        </div>
      )}
    </li>
  );
}
