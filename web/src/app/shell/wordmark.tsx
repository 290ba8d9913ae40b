import { Link } from 'react-router-dom';

/** Our mark: a short log band with its marker, beside the name. */
/** `compact`: the name only from 640 px, so a phone's header keeps room for the alarm counters. */
export function Wordmark({ size = 'md', link = true, compact = false }: { size?: 'md' | 'lg'; link?: boolean; compact?: boolean }) {
  const big = size === 'lg';
  const content = (
    <>
      <svg viewBox="0 0 32 20" className={big ? 'h-8 w-12' : 'h-5 w-8'} aria-hidden="true">
        <line x1="1" x2="31" y1="14" y2="14" stroke="currentColor" strokeOpacity="0.45" strokeWidth="1.5" />
        <rect x="10" y="10" width="12" height="8" fill="currentColor" fillOpacity="0.35" />
        <path d="M 13 1 L 21 1 L 17 9 Z" fill="currentColor" />
      </svg>
      <span className={`${big ? 'text-4xl' : 'text-xl'} ${compact ? 'hidden sm:inline' : ''}`}>Ferrisight</span>
    </>
  );
  const style = 'inline-flex items-center gap-2 font-bold tracking-tight text-ink';
  return link ? (
    <Link to="/" className={style} aria-label="Ferrisight, go to the Floor">
      {content}
    </Link>
  ) : (
    <span className={style}>{content}</span>
  );
}
