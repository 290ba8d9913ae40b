import { DEAD_LETTER_KIND_LABELS, type DeadLetterKind } from '@shared/schemas/dead-letters';
import type { GatewaySecret, SetupGateway } from '@shared/schemas/plant-setup';
import { useNow } from '../../../lib/clock';
import { useRotateGatewayPassword } from '../api/rotate-gateway-password';
import { useSavePart } from '../api/save-part';
import { ReasonAction } from './reason-action';
import { RetireButton } from './retire-button';

function status(g: SetupGateway, now: number): string {
  if (!g.live) return 'not seen since the broker started';
  const ago = Math.max(0, Math.round((now - Date.parse(g.live.lastSeenAt)) / 1000));
  const conn = g.live.connections > 0 ? `connected (${g.live.connections})` : 'not connected';
  return `${conn} · last seen ${ago} s ago · ${g.live.messagesLastHour} messages in the last hour`;
}

type Props = { gateway: SetupGateway; canEdit: boolean; onSecret: (s: GatewaySecret) => void; onEdit: () => void };

export function GatewayRow({ gateway: g, canEdit, onSecret, onEdit }: Props) {
  const now = useNow();
  const rotate = useRotateGatewayPassword(g.id);
  const toggle = useSavePart('gateways', g.id);
  const letters = Object.entries(g.deadLettersByKind) as Array<[DeadLetterKind, number]>;
  return (
    <li className={`flex flex-col gap-1 border-t border-line py-2 ${g.retiredAt ? 'opacity-60' : ''}`} aria-label={`Gateway ${g.username}`}>
      <div className="flex flex-wrap items-baseline gap-x-3">
        <span className="font-mono font-semibold">{g.username}</span>
        {g.name && <span>{g.name}</span>}
        <span className="text-sm text-ink-muted">{g.retiredAt ? 'retired' : g.enabled ? status(g, now) : 'disabled: logins refused'}</span>
      </div>
      {letters.length > 0 && (
        <p className="text-sm text-ink-muted">
          Dead letters: {letters.map(([k, n]) => `${DEAD_LETTER_KIND_LABELS[k]} ${n}`).join(' · ')}
        </p>
      )}
      {canEdit && !g.retiredAt && (
        <div className="flex flex-wrap gap-2">
          <button type="button" className="text-sm text-info-ink underline" onClick={onEdit}>Edit</button>
          <ReasonAction label="New password" prompt="Why a new password?" confirm="Make a new password" pending={rotate.isPending} error={rotate.error}
            onConfirm={(reason, done) => rotate.mutate(reason, { onSuccess: (s) => { done(); onSecret(s); } })} />
          <ReasonAction label={g.enabled ? 'Disable' : 'Enable'} prompt={g.enabled ? 'Why disable it?' : 'Why enable it?'} confirm={g.enabled ? 'Disable' : 'Enable'}
            pending={toggle.isPending} error={toggle.error} onConfirm={(reason, done) => toggle.mutate({ enabled: !g.enabled, reason }, { onSuccess: done })} />
          <RetireButton kind="gateways" id={g.id} label={`gateway ${g.username}`} />
        </div>
      )}
    </li>
  );
}
