import type { ReactNode } from 'react';

/**
 * A CSV download from the API: a plain link, so the browser streams the file to disk with the
 * sign-in cookie and nothing is held in the page. The server writes every CSV (formula-escaped).
 */
export function CsvLink({ href, label, children = 'Export CSV' }: { href: string; label?: string; children?: ReactNode }) {
  return (
    <a href={href} download aria-label={label} className="text-sm font-semibold text-info-ink underline print:hidden">
      {children}
    </a>
  );
}
