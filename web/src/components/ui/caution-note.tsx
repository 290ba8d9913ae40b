import type { ReactNode } from 'react';

export const ADVISORY_CAUTION =
  "Advisory tool: it does not replace the control system's alarms, the safety system, site procedures or permit-to-work.";

/** Quiet but always present where the advice could be mistaken for an instruction. */
export function CautionNote({ children = ADVISORY_CAUTION, className = '' }: { children?: ReactNode; className?: string }) {
  return (
    <p className={`text-xs leading-snug text-ink-muted ${className}`}>
      <span aria-hidden="true" className="mr-1 font-bold">
        !
      </span>
      {children}
    </p>
  );
}
