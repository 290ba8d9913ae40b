import type { ReactNode } from 'react';
import { Button } from './button';

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" data-testid="loading" className="flex h-full min-h-32 items-center justify-center text-ink-muted">
      {label}
    </div>
  );
}

/** An error in words, with what to do next. */
export function ErrorState({ title, detail, onRetry, children }: { title: string; detail?: string; onRetry?: () => void; children?: ReactNode }) {
  return (
    <div role="alert" className="mx-auto my-10 max-w-lg rounded-lg border border-line bg-panel p-6">
      <h2 className="text-lg font-bold">{title}</h2>
      {detail && <p className="mt-2 text-ink-muted">{detail}</p>}
      {children}
      {onRetry && (
        <div className="mt-4 flex justify-end">
          <Button onClick={onRetry}>Try again</Button>
        </div>
      )}
    </div>
  );
}
