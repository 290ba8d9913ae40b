import { PRIORITY_LABEL } from '../../../../shared/alarms/kinds.ts';
import type { AlarmView } from '../../../../shared/schemas/alarms.ts';
import { ON_CALL_LABEL, type OnCallRole } from '../../../../shared/schemas/roster.ts';

/** Escalation mail: the same facts in a plain-text and an HTML part, composed once and stored in the outbox. */
/** `sentAt` is set once that person's own mail has gone, so a retry never sends it twice. */
export type Recipient = { personName: string; email: string; roleOnCall: OnCallRole; ackUrl: string; sentAt?: string };
export type Told = { personName: string; roleOnCall: OnCallRole; step: number; at: string };
export type MailContext = {
  alarm: AlarmView;
  siteName: string;
  /** null for a plant-wide alarm. */
  band: { low: number; high: number } | null;
  latest: { ratio: number; orpMv: number; tempC: number; ts: string } | null;
  step: number;
  afterMin: number;
  recipients: Recipient[];
  told: Told[];
  /** null for a plant-wide alarm. */
  tankUrl: string | null;
  /** The alarm itself on the Alarm desk. */
  alarmUrl: string;
  timeZone: string;
  linkExpiresAt: Date;
  now: Date;
};
export type ComposedMail = { subject: string; text: string; html: string };

const ratio = (r: number) => (r < 10 ? r.toPrecision(2) : String(Math.round(r)));
const mv = (v: number) => `${v >= 0 ? '+' : '−'}${Math.abs(Math.round(v))} mV`;

function when(iso: string | Date, tz: string): string {
  const d = new Date(iso);
  const local = new Intl.DateTimeFormat('en-CA', { timeZone: tz, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(d);
  return `${local.replace(',', '')} ${tz} (${d.toISOString().slice(11, 16)} UTC)`;
}

function valueLine(c: MailContext): string {
  const a = c.alarm;
  if ((a.kind === 'ratio-below-band' || a.kind === 'ratio-above-band') && c.band) {
    return `${a.firstValue === null ? '—' : ratio(a.firstValue)} at activation; band ${ratio(c.band.low)}–${ratio(c.band.high)}`;
  }
  const v = a.firstValue === null ? '—' : `${Math.round(a.firstValue * 10) / 10} ${a.unit}`;
  return `${v} at activation; limit ${a.limitValue ?? '—'} ${a.unit}`;
}

/** Rows of facts shared by both parts: [label, value]. */
function facts(c: MailContext): Array<[string, string]> {
  const a = c.alarm;
  const minutes = a.unackSince ? Math.max(0, Math.round((c.now.getTime() - Date.parse(a.unackSince)) / 60_000)) : c.afterMin;
  const rows: Array<[string, string]> = [
    a.tankId === null ? ['Where', 'The whole plant: Ferrisight itself, not a tank'] : ['Tank', `${a.tankTag} · ${a.tankName} (${a.circuitTag})`],
    ['Alarm', `${a.label} (${PRIORITY_LABEL[a.priority]})`],
    ['Value', valueLine(c)],
  ];
  if (c.latest) rows.push(['Latest reading', `ratio ${ratio(c.latest.ratio)}, ${mv(c.latest.orpMv)}, ${c.latest.tempC.toFixed(1)} °C at ${when(c.latest.ts, c.timeZone)}`]);
  rows.push(
    ['Since', `${when(a.activatedAt ?? a.openedAt, c.timeZone)}; unacknowledged for ${minutes} min`],
    ['Escalation', `step ${c.step}, after ${c.afterMin} min unacknowledged`],
    ['Respond within', `${a.rationalisation.responseMin} min`],
    ['Likely cause', a.rationalisation.cause],
    ['If nobody acts', a.rationalisation.consequence],
    ['What to do', a.rationalisation.action],
  );
  return rows;
}

function toldLines(c: MailContext): string[] {
  const earlier = c.told.map((t) => `${t.personName} (${ON_CALL_LABEL[t.roleOnCall]}), step ${t.step}, ${when(t.at, c.timeZone)}`);
  const now = c.recipients.map((r) => `${r.personName} (${ON_CALL_LABEL[r.roleOnCall]}), this step`);
  return [...earlier, ...now];
}

const CAUTION = 'Ferrisight is an advisory tool: it does not replace the control system\'s own alarms, the safety system, site procedures or permit-to-work.';

/**
 * Where each person's own acknowledge link goes. The stored mail holds these markers; the
 * outbox fills them in per recipient, so nobody receives a link that acts in another's name.
 */
const TEXT_SLOT = '[[ferrisight-personal-ack]]';
const HTML_SLOT = '<!--ferrisight-personal-ack-->';
const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => `&#${ch.charCodeAt(0)};`);

export function composeMail(c: MailContext): ComposedMail {
  const a = c.alarm;
  const subject = `P${a.priority} ${a.tankTag ?? 'Plant'}: ${a.label}, unacknowledged (step ${c.step})`;
  const expires = when(c.linkExpiresAt, c.timeZone);
  const text = [
    `A P${a.priority} alarm at ${c.siteName} is waiting for acknowledgement.`, '',
    ...facts(c).map(([k, v]) => `${`${k}:`.padEnd(16)} ${v}`), '',
    'Told so far:', ...toldLines(c).map((l) => `  - ${l}`), '',
    `The alarm: ${c.alarmUrl}`,
    ...(c.tankUrl ? [`Tank page: ${c.tankUrl}`] : []), '',
    TEXT_SLOT,
    `(Your link is yours alone: it works once, until ${expires}, and asks you to confirm first.)`, '',
    CAUTION, '',
  ].join('\n');
  const html = `<!doctype html><html><body style="font-family:Barlow,Arial,sans-serif;color:#12171c">
<p><strong>A P${a.priority} alarm at ${esc(c.siteName)} is waiting for acknowledgement.</strong></p>
<table cellpadding="4" style="border-collapse:collapse">${facts(c).map(([k, v]) => `<tr><th align="left" valign="top">${esc(k)}</th><td>${esc(v)}</td></tr>`).join('')}</table>
<p><strong>Told so far</strong></p><ul>${toldLines(c).map((l) => `<li>${esc(l)}</li>`).join('')}</ul>
<p><a href="${esc(c.alarmUrl)}">Open the alarm</a>${c.tankUrl ? ` · <a href="${esc(c.tankUrl)}">Open the tank page</a>` : ''}</p>
${HTML_SLOT}
<p style="color:#444e59">Your link is yours alone: it works once, until ${esc(expires)}, and asks you to confirm first.</p>
<p style="color:#444e59;font-size:90%">${esc(CAUTION)}</p>
</body></html>`;
  return { subject, text, html };
}

/** One recipient's copy: only that person's acknowledge link. */
export function personalMail(mail: Pick<ComposedMail, 'text' | 'html'>, r: Pick<Recipient, 'personName' | 'ackUrl'>): Pick<ComposedMail, 'text' | 'html'> {
  return {
    text: mail.text.split(TEXT_SLOT).join(`Acknowledge as ${r.personName}: ${r.ackUrl}`),
    html: mail.html.split(HTML_SLOT).join(`<p><a href="${esc(r.ackUrl)}">Acknowledge as ${esc(r.personName)}</a></p>`),
  };
}
