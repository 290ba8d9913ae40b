import { useState } from 'react';
import type { ShiftView } from '@shared/schemas/shifts';
import { Button } from '../../../components/ui/button';
import { TextAreaField } from '../../../components/ui/field';
import { formMessage, serverFieldErrors } from '../../../lib/form';
import { useCloseShift } from '../api/close-shift';

/** The supervisor's handover: a note, then the shift is closed and its entries frozen (asks first). */
export function HandoverForm({ shift, onClosed }: { shift: ShiftView; onClosed: (s: ShiftView) => void }) {
  const close = useCloseShift();
  const [note, setNote] = useState('');
  const [confirming, setConfirming] = useState(false);
  const errors = serverFieldErrors(close.error);
  return (
    <div className="flex flex-col gap-3">
      <TextAreaField label="Handover note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={8000} error={errors.handoverNote}
        placeholder="State of the tanks, what is pending, what to watch" />
      {formMessage(close.error) && <p role="alert" className="text-sm font-medium text-attention-1-ink">{formMessage(close.error)}</p>}
      <div className="flex justify-end gap-2">
        {confirming ? (
          <>
            <span className="self-center text-sm">Entries of this shift can no longer be reworded after this. Close it?</span>
            <Button onClick={() => setConfirming(false)}>Not yet</Button>
            <Button variant="primary" disabled={close.isPending}
              onClick={() => close.mutate({ startsAt: shift.startsAt, handoverNote: note }, { onSuccess: onClosed, onSettled: () => setConfirming(false) })}>
              Close the shift
            </Button>
          </>
        ) : (
          <Button variant="primary" disabled={!note.trim()} onClick={() => setConfirming(true)}>Hand over…</Button>
        )}
      </div>
    </div>
  );
}
