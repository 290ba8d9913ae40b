import { describe, expect, it } from 'vitest';
import { SERVICE_PASSWORD, connect, useBrokerRig, waitFor } from './support.ts';

const rig = useBrokerRig();

const service = (clientId: string, clean = true) =>
  connect(rig.broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId, clean });

describe('broker delivery to a persistent session', () => {
  it('when three publishers send QoS 1 concurrently, then the clean: false subscriber receives every message live', async () => {
    // Regression: aedes "dedupe" skipped packets emitted out of counter order; with level
    // persistence they then waited in the store until the subscriber reconnected.
    const sub = await service('ferrisight-delivery-sub', false);
    const seen = new Set<number>();
    sub.on('message', (_t, p) => seen.add(Number(p.toString())));
    await sub.subscribeAsync('ferrisight/v1/#', { qos: 1 });
    const pubs = await Promise.all([0, 1, 2].map((i) => service(`ferrisight-delivery-pub-${i}`)));
    const N = 6000;
    const sends: Promise<unknown>[] = [];
    for (let i = 1; i <= N; i += 1) {
      sends.push(pubs[i % 3].publishAsync('ferrisight/v1/kestrel/X/reading', String(i), { qos: 1 }));
      if (i % 300 === 0) await new Promise((r) => setImmediate(r));
    }
    await Promise.all(sends);
    await waitFor(async () => seen.size === N, 10_000).catch(() => undefined);
    await Promise.all([...pubs, sub].map((c) => c.endAsync()));
    expect(N - seen.size).toBe(0);
  });
});
