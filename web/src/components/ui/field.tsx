import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

type FieldShellProps = { label: string; id: string; error?: string; hint?: string; children: ReactNode };

/** Label above, the control, then a hint or the error in words under it. */
function FieldShell({ label, id, error, hint, children }: FieldShellProps) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      {children}
      {error ? (
        <p id={`${id}-msg`} className="text-sm font-medium text-attention-1-ink">
          <span aria-hidden="true">✕ </span>
          {error}
        </p>
      ) : hint ? (
        <p id={`${id}-msg`} className="text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

/** The control's id and its link to the message under it (error or hint). */
const controlAria = (id: string, error?: string, hint?: string) => ({
  id,
  'aria-invalid': error ? true : undefined,
  'aria-describedby': error || hint ? `${id}-msg` : undefined,
});

const CONTROL =
  'h-10 w-full rounded-md border bg-panel px-3 text-base text-ink placeholder:text-ink-muted aria-[invalid=true]:border-attention-1 aria-[invalid=true]:border-2';

type TextFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> & {
  label: string;
  error?: string;
  hint?: string;
  /** Shown inside the field end, e.g. "mV". */
  unit?: string;
};

export function TextField({ label, error, hint, unit, className = '', ...input }: TextFieldProps) {
  const id = useId();
  return (
    <FieldShell label={label} id={id} error={error} hint={hint}>
      <div className="relative">
        <input
          {...controlAria(id, error, hint)}
          className={`${CONTROL} border-line-strong ${unit ? 'pr-12' : ''} ${className}`}
          {...input}
        />
        {unit && (
          <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm text-ink-muted">{unit}</span>
        )}
      </div>
    </FieldShell>
  );
}

type SelectFieldProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, 'id'> & {
  label: string;
  error?: string;
  hint?: string;
  options: ReadonlyArray<{ value: string; label: string }>;
};

export function SelectField({ label, error, hint, options, className = '', ...select }: SelectFieldProps) {
  const id = useId();
  return (
    <FieldShell label={label} id={id} error={error} hint={hint}>
      <select
        {...controlAria(id, error, hint)}
        className={`${CONTROL} border-line-strong ${className}`}
        {...select}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldShell>
  );
}

type TextAreaFieldProps = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> & { label: string; error?: string; hint?: string };

/** A multi-line field: notes, handovers, an alarm's rationalisation. */
export function TextAreaField({ label, error, hint, className = '', ...rest }: TextAreaFieldProps) {
  const id = useId();
  return (
    <FieldShell label={label} id={id} error={error} hint={hint}>
      <textarea
        {...controlAria(id, error, hint)}
        className={`min-h-20 w-full rounded-md border border-line-strong bg-panel px-3 py-2 text-base text-ink aria-[invalid=true]:border-2 aria-[invalid=true]:border-attention-1 ${className}`}
        {...rest}
      />
    </FieldShell>
  );
}

/** Form-level message (e.g. wrong credentials), announced to screen readers. */
export function FormError({ children }: { children: ReactNode }) {
  if (!children) return null;
  return (
    <div role="alert" className="rounded-md border-l-4 border-attention-1 bg-attention-1-soft px-3 py-2 text-sm font-medium text-attention-1-ink">
      {children}
    </div>
  );
}
