import { createHash } from 'node:crypto';
import type { AckPage } from './ack.service.ts';

/**
 * Server-rendered pages for the e-mail acknowledge link: no script, no sign-in, readable on a
 * phone at night. The confirm page posts a plain form back to the same address (outside /api,
 * so the app's CSRF header rule does not apply; the signed single-use token is the credential).
 */
const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => `&#${ch.charCodeAt(0)};`);

const STATUS: Record<AckPage['outcome'] | 'unconfigured', number> = {
  confirm: 200, done: 200, nothing: 409, used: 410, expired: 410, invalid: 400, unconfigured: 503,
};

function summary(p: AckPage): string {
  const a = p.alarm;
  if (!a) return '';
  return `<p class="alarm"><span class="pill p${a.priority}">P${a.priority}</span> <strong>${esc(a.tankTag ?? 'Plant')}</strong> · ${esc(a.label)}</p>
<p><a href="/alarm-desk?alarm=${a.id}">Open this alarm on the Alarm desk</a> (sign-in needed)</p>`;
}

function body(p: AckPage | null, action: string): { title: string; html: string } {
  if (!p) return { title: 'Acknowledge links are not set up', html: '<p>This Ferrisight server has no signing key for acknowledge links. Use the Alarm desk instead.</p>' };
  const who = p.personName ? esc(p.personName) : 'you';
  const handled = p.alarm?.ackedBy ? ` It was acknowledged by ${esc(p.alarm.ackedBy)}${p.alarm.ackedAt ? ` at ${new Date(p.alarm.ackedAt).toISOString().slice(0, 16).replace('T', ' ')} UTC` : ''}.` : '';
  switch (p.outcome) {
    case 'confirm':
      return { title: 'Acknowledge this alarm?', html: `${summary(p)}<p>You are acknowledging as <strong>${who}</strong>. The alarm history will show it was done from the e-mail link.</p>
<form method="post" action="${esc(action)}"><label for="c">Comment (optional)</label><textarea id="c" name="comment" maxlength="1000" rows="3"></textarea>
<button type="submit">Acknowledge</button></form>` };
    case 'done':
      return { title: 'Alarm acknowledged', html: `${summary(p)}<p>Acknowledged as <strong>${who}</strong>. Further escalation for this alarm has stopped.</p>` };
    case 'nothing':
      return { title: 'Nothing to acknowledge', html: `${summary(p)}<p>This alarm no longer waits for acknowledgement, so nothing was changed.${handled}</p>` };
    case 'used':
      return { title: 'This link has already been used', html: `${summary(p)}<p>Each acknowledge link works once. Nothing was changed.${handled}</p>` };
    case 'expired':
      return { title: 'This link has expired', html: '<p>Nothing was changed. Open the Alarm desk to see the alarm and acknowledge it there.</p>' };
    case 'invalid':
      return { title: 'This link is not valid', html: '<p>The link is incomplete or has been altered. Nothing was changed. Open the Alarm desk instead, or ask for a new message.</p>' };
  }
}

const ACK_PAGE_CSS = `
body{margin:0;font-family:Barlow,system-ui,sans-serif;background:#171c21;color:#eef2f5}
a{color:#7cc8d8}main{max-width:34rem;margin:3rem auto;padding:1.5rem;background:#232a31;border:1px solid #444e59;border-radius:.5rem}
h1{font-size:1.4rem;margin:0 0 1rem}label{display:block;margin-top:1rem}
textarea{width:100%;box-sizing:border-box;background:#171c21;color:#eef2f5;border:1px solid #5b6672;border-radius:.25rem;font:inherit}
button{margin-top:1rem;padding:.6rem 1.2rem;font:inherit;font-weight:600;background:#eef2f5;color:#12171c;border:0;border-radius:.25rem;cursor:pointer}
.pill{display:inline-block;padding:0 .5rem;border-radius:1rem;font-weight:700}
.p1{background:#d8431f;color:#fff;border-left:.35rem solid #fff}.p2{background:#e0a21a;color:#12171c;border-left:.15rem solid #12171c}.p3{border:2px solid #a58bf0;color:#d9ccff}
`;

/**
 * The page's own policy: no scripts at all, and only this one style block, allowed by its hash
 * (CSP Level 3 hash-source), so the app-wide "no inline styles" rule still holds everywhere else.
 */
export const ACK_PAGE_CSP = [
  "default-src 'none'", `style-src 'sha256-${createHash('sha256').update(ACK_PAGE_CSS).digest('base64')}'`,
  "form-action 'self'", "base-uri 'none'", "frame-ancestors 'none'",
].join('; ');

export function renderAckPage(p: AckPage | null, action: string): { status: number; html: string } {
  const { title, html } = body(p, action);
  return {
    status: STATUS[p?.outcome ?? 'unconfigured'],
    html: `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<meta name="robots" content="noindex"><title>${esc(title)} · Ferrisight</title><style>${ACK_PAGE_CSS}</style></head><body><main><h1>${esc(title)}</h1>${html}<p><small>Ferrisight · advisory; follow site procedures.</small></p></main></body></html>`,
  };
}
