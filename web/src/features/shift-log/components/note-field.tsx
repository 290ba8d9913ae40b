import { useId, type TextareaHTMLAttributes } from 'react';

type Props = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> & { label: string; error?: string };

/** A multi-line field in the form style of components/ui/field: label above, error in words under it. */
export function NoteField({ label, error, className = '', ...rest }: Props) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold">{label}</label>
      <textarea
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-msg` : undefined}
        className={`min-h-20 w-full rounded-md border border-line-strong bg-panel px-3 py-2 text-base text-ink aria-[invalid=true]:border-2 aria-[invalid=true]:border-attention-1 ${className}`}
        {...rest}
      />
      {error && (
        <p id={`${id}-msg`} className="text-sm font-medium text-attention-1-ink">
          <span aria-hidden="true">✕ </span>
          {error}
        </p>
      )}
    </div>
  );
}
