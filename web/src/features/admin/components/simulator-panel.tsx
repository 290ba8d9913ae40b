import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { CautionNote } from '../../../components/ui/caution-note';
import { FormError, SelectField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { SIM_FAULTS, type SimFault } from '@shared/schemas/simulator';
import { useSimulator } from '../api/get-simulator';
import { useSetSimulatorFault } from '../api/set-simulator-fault';

export const FAULT_LABELS: Record<SimFault, string> = {
  fouling: 'Probe fouling (slow drift)',
  flatline: 'Flat-lined probe',
  noisy: 'Noisy probe',
  'comms-loss': 'Communication loss',
  'feed-upset': 'Feed upset (ratio drops)',
  'pump-trip': 'Oxidant pump trip',
};

export type ProbeChoice = { tag: string; label: string };

/** Plays faults on the simulated plant, for demos and operator training. */
export function SimulatorPanel({ probes }: { probes: ProbeChoice[] }) {
  const active = useSimulator();
  const command = useSetSimulatorFault();
  const [probeTag, setProbeTag] = useState('');
  const [fault, setFault] = useState<SimFault>('fouling');
  const chosenProbe = probeTag || probes[0]?.tag || '';

  const send = (action: 'start' | 'clear', cmd = { fault, probeTag: chosenProbe }) => command.mutate({ ...cmd, action });

  return (
    <Panel title="Simulator faults">
      <div className="flex flex-col gap-4">
        <CautionNote>Acts on the simulated probes only. Never point the simulator at a live plant's broker.</CautionNote>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="Probe"
            value={chosenProbe}
            onChange={(e) => setProbeTag(e.target.value)}
            options={probes.length ? probes.map((p) => ({ value: p.tag, label: p.label })) : [{ value: '', label: 'No probes' }]}
          />
          <SelectField
            label="Fault"
            value={fault}
            onChange={(e) => setFault(e.target.value as SimFault)}
            options={SIM_FAULTS.map((f) => ({ value: f, label: FAULT_LABELS[f] }))}
          />
        </div>
        <FormError>{command.error?.message}</FormError>
        {command.isSuccess && !command.isPending && (
          <p role="status" className="text-sm text-ink-muted">
            Sent. The simulator applies it within a few seconds.
          </p>
        )}
        <div className="flex justify-end gap-3">
          <Button disabled={!chosenProbe || command.isPending} onClick={() => send('clear')}>
            Clear fault
          </Button>
          <Button variant="primary" disabled={!chosenProbe || command.isPending} onClick={() => send('start')}>
            Start fault
          </Button>
        </div>
        <div>
          <h3 className="mb-1 text-sm font-bold">Running now</h3>
          {active.isError ? (
            <p className="text-sm text-attention-1-ink">{active.error.message}</p>
          ) : !active.data || active.data.length === 0 ? (
            <p className="text-sm text-ink-muted">{active.isPending ? 'Loading…' : 'No faults running.'}</p>
          ) : (
            <ul className="flex flex-col gap-1">
              {active.data.map((f) => (
                <li key={`${f.probeTag}-${f.fault}`} className="flex items-center justify-between gap-3 rounded-md bg-panel-2 px-3 py-1.5 text-sm">
                  <span>
                    <span className="font-semibold">{f.probeTag}</span> · {FAULT_LABELS[f.fault] ?? f.fault}
                  </span>
                  <Button size="sm" disabled={command.isPending} onClick={() => send('clear', f)}>
                    Clear
                  </Button>
                </li>
              ))}
            </ul>
          )}
        </div>
      </div>
    </Panel>
  );
}
