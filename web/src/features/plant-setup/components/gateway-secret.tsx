import type { GatewaySecret } from '@shared/schemas/plant-setup';
import { Button } from '../../../components/ui/button';

/** The only time a gateway password is shown: it is stored hashed. */
export function GatewaySecretNotice({ secret, siteTag, onClose }: { secret: GatewaySecret; siteTag: string; onClose: () => void }) {
  return (
    <div role="status" className="flex flex-col gap-2 rounded-md border-l-4 border-info bg-panel-2 px-4 py-3 text-sm">
      <p className="font-semibold">Password for gateway {secret.gateway.username}: copy it now, it is not shown again.</p>
      <code data-testid="gateway-password" className="select-all break-all rounded bg-panel px-2 py-1 font-mono text-base">{secret.password}</code>
      <p className="text-ink-muted">
        MQTT 3.1.1, username <code>{secret.gateway.username}</code>, QoS 1, topics under <code>ferrisight/v1/{siteTag}/</code> (see the README, “Connecting probes”).
      </p>
      <div className="flex justify-end"><Button size="sm" onClick={onClose}>Done</Button></div>
    </div>
  );
}
