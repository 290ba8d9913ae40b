import { Link } from 'react-router-dom';

export type Priority = 1 | 2 | 3;

// P1: solid with a thick left bar; P2: solid with a thin left bar; P3: outlined. Shape and text, not only colour.
const STYLE: Record<Priority, string> = {
  1: 'bg-attention-1-fill text-attention-1-on border-l-[6px] border-attention-1-ink',
  2: 'bg-attention-2-fill text-attention-2-on border-l-2 border-attention-2-ink',
  3: 'bg-transparent text-attention-3-ink border-2 border-attention-3',
};
const QUIET = 'bg-transparent text-ink-muted border border-line-strong';

/** Alarm count for one priority; zero is drawn quietly, in outline grey, with the same text. */
export function PriorityCount({ priority, count, to }: { priority: Priority; count: number; to: string }) {
  const style = count > 0 ? STYLE[priority] : `${QUIET} ${priority === 1 ? 'border-l-[6px]' : priority === 2 ? 'border-l-2' : ''}`;
  return (
    <Link
      to={to}
      className={`inline-flex h-7 items-center gap-1 rounded-full px-2 text-sm sm:gap-1.5 sm:px-2.5 font-bold tabular-nums ${style}`}
      aria-label={`Priority ${priority} alarms: ${count}`}
    >
      <span>P{priority}</span>
      <span>{count}</span>
    </Link>
  );
}

/** One alarm's priority as a pill: the same shapes as the counters, optionally pulsing while unacknowledged. */
export function PriorityPill({ priority, pulse = false, className = '' }: { priority: Priority; pulse?: boolean; className?: string }) {
  return (
    <span
      className={`inline-flex h-6 shrink-0 items-center rounded-full px-2 text-xs font-bold ${STYLE[priority]} ${pulse ? 'pulse-attention' : ''} ${className}`}
      aria-label={`Priority ${priority}`}
    >
      P{priority}
    </span>
  );
}
