import { useEffect, useState } from 'react';
import { Button } from '../../../components/ui/button';

type Paper = 'A4' | 'letter';
const KEY = 'ferrisight.print-paper';

/** Letter where it is the usual paper (US, Canada, …), A4 elsewhere, until the user picks. */
function defaultPaper(): Paper {
  const saved = localStorage.getItem(KEY);
  if (saved === 'A4' || saved === 'letter') return saved;
  return /^(en-US|en-CA|es-MX|fr-CA)$/.test(navigator.language) ? 'letter' : 'A4';
}

/**
 * Paper choice and the print button. @page cannot depend on a class, so the chosen size goes
 * into a constructed style sheet (CSSOM, which the no-inline-styles policy allows, unlike a
 * style element); the layout itself is fluid and fits both sheets.
 */
export function PrintSetup() {
  const [paper, setPaper] = useState<Paper>(defaultPaper);
  useEffect(() => {
    const sheet = new CSSStyleSheet();
    sheet.replaceSync(`@page { size: ${paper} portrait; margin: 12mm 11mm 14mm; }`);
    document.adoptedStyleSheets = [...document.adoptedStyleSheets, sheet];
    return () => {
      document.adoptedStyleSheets = document.adoptedStyleSheets.filter((s) => s !== sheet);
    };
  }, [paper]);
  const choose = (p: Paper) => {
    localStorage.setItem(KEY, p);
    setPaper(p);
  };
  return (
    <div className="flex items-center gap-2 print:hidden">
      <label className="text-sm text-ink-muted" htmlFor="digest-paper">Paper</label>
      <select id="digest-paper" value={paper} onChange={(e) => choose(e.target.value as Paper)} className="h-8 rounded-md border border-line-strong bg-panel px-2 text-sm">
        <option value="A4">A4</option>
        <option value="letter">Letter</option>
      </select>
      <Button size="sm" variant="primary" onClick={() => window.print()}>Print</Button>
    </div>
  );
}
