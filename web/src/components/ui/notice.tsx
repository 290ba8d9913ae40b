import type { ReactNode } from 'react';

type Tone = 'neutral' | 'attention' | 'info';

const TONES: Record<Tone, string> = {
  neutral: 'border-line-strong bg-panel-2 text-ink',
  attention: 'border-attention-2 bg-attention-2-soft text-attention-2-ink',
  info: 'border-info bg-panel-2 text-ink',
};

/** A one-line banner with a left rule; role=status so changes are announced. */
export function Notice({ tone = 'neutral', children, className = '' }: { tone?: Tone; children: ReactNode; className?: string }) {
  return (
    <div role="status" className={`rounded-md border-l-4 px-3 py-1.5 text-sm ${TONES[tone]} ${className}`}>
      {children}
    </div>
  );
}
