import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { unplacedMessage } from '../../../lib/form';

/**
 * One text field and a button: comments, acknowledge notes, out-of-service reasons. The text
 * stays until the caller clears it on success, so a refused request loses nothing.
 */
export function ReasonForm(props: {
  label: string; action: string; minLength: number; pending: boolean; error: unknown; hint?: string;
  onSubmit: (text: string, clear: () => void) => void; onCancel?: () => void;
}) {
  const [text, setText] = useState('');
  const [tooShort, setTooShort] = useState(false);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (text.trim().length < props.minLength) return setTooShort(true);
    setTooShort(false);
    props.onSubmit(text.trim(), () => setText(''));
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-2" aria-label={props.action}>
      <TextField label={props.label} value={text} onChange={(e) => setText(e.target.value)} maxLength={1000} hint={props.hint}
        error={tooShort ? `At least ${props.minLength} characters` : undefined} />
      <FormError>{unplacedMessage(props.error, [])}</FormError>
      <div className="flex justify-end gap-2">
        {props.onCancel && <Button variant="ghost" onClick={props.onCancel}>Cancel</Button>}
        <Button type="submit" disabled={props.pending}>{props.action}</Button>
      </div>
    </form>
  );
}
