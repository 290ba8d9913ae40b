import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { unplacedMessage } from '../../../lib/form';

/**
 * One note box for the two things said about an alarm: acknowledge it (the note is optional
 * and goes with the acknowledgement) or add the note as a comment. The text stays until a
 * request succeeds, so a refused request loses nothing.
 */
export function NoteForm(props: {
  canAck: boolean; ackPending: boolean; commentPending: boolean; error: unknown;
  onAcknowledge: (note: string | undefined, clear: () => void) => void; onComment: (text: string, clear: () => void) => void;
}) {
  const [text, setText] = useState('');
  const [empty, setEmpty] = useState(false);
  const clear = () => setText('');
  const comment = (e: FormEvent) => {
    e.preventDefault();
    if (!text.trim()) return setEmpty(true);
    setEmpty(false);
    props.onComment(text.trim(), clear);
  };
  return (
    <form onSubmit={comment} className="flex flex-col gap-2" aria-label="Note on this alarm">
      <TextField label={props.canAck ? 'Note (optional with acknowledge)' : 'Comment'} value={text} maxLength={1000}
        onChange={(e) => (setText(e.target.value), setEmpty(false))} error={empty ? 'Write the comment first' : undefined} />
      <FormError>{unplacedMessage(props.error, [])}</FormError>
      <div className="flex flex-wrap justify-end gap-2">
        <Button type="submit" disabled={props.commentPending}>Add comment</Button>
        {props.canAck && (
          <Button variant="primary" disabled={props.ackPending} onClick={() => props.onAcknowledge(text.trim() || undefined, clear)}>
            Acknowledge
          </Button>
        )}
      </div>
    </form>
  );
}
