/**
 * Every message sent twice → 0 duplicate rows; a different value for a
 * stored (probe, ts) is recorded in reading_conflicts, never written over the first.
 * The first case is the plain stream with no fault at all: it is what caught aedes dropping
 * out-of-order QoS 1 packets (moscajs/aedes#955) — nothing may wait for a reconnect to arrive.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchTopic } from '../../shared/schemas/readings.ts';
import type { TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, waitForCount } from './lib/compare.ts';
import { drive, startLiveRig, stopLiveRig, type Rig } from './lib/rig.ts';

let db: TestDatabase;
let rig: Rig;

beforeAll(async () => {
  ({ db, rig } = await startLiveRig(20));
});
afterAll(() => stopLiveRig({ db, rig }));

describe('duplicates and conflicts', () => {
  it('when 2,000 readings/s flow with no fault, then every one is stored within 5 s of its PUBACK, without any reconnect', async () => {
    const device = await rig.device('relia-dev-steady', { clean: false });
    const stream = rig.stream();
    const run = await drive(device, stream, { readingsPerS: 2_000, batch: 10, durationMs: 5_000 });
    await run.acked;
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 5_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    console.log(formatComparison('steady stream', c), `drained ${drained.ms} ms after the last PUBACK`);
    expect(drained.reached).toBe(true);
    expect(c.ok).toBe(true);
  }, 30_000);

  it('when every message is sent twice, then there is one row per reading and no conflict', async () => {
    const device = await rig.device('relia-dev-twice', { clean: false });
    const stream = rig.stream(1_000_000);
    const run = await drive(device, stream, { readingsPerS: 2_000, batch: 10, durationMs: 5_000, twice: true });
    await run.acked;
    await waitForCount(rig.pool, stream.sent.snapshot(), 15_000);
    // Give the second copies time to land too: they arrive after the first ones.
    await new Promise((r) => setTimeout(r, 1_000));
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    console.log(formatComparison('every message twice', c));
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
  }, 30_000);

  it('when stored readings come again with other values, then each is recorded as a conflict and the first value stays', async () => {
    const device = await rig.device('relia-dev-conflict', { clean: false });
    const stream = rig.stream(2_000_000);
    const first = stream.next(200);
    await device.publishAsync(first.topic, first.payload, { qos: 1 });
    await waitForCount(rig.pool, stream.sent.snapshot(), 10_000);
    // Same probe and ts, 7 mV more: a device bug or a replayed buffer with re-computed values.
    const changed = first.readings.map(({ probe, ts, orpMv, tempC, seq }) => ({ probe, ts, orpMv: orpMv + 7, tempC, seq }));
    await device.publishAsync(batchTopic(rig.siteTag), JSON.stringify({ readings: changed }), { qos: 1 });
    const ids = rig.probes.map((p) => p.id).join(',');
    const deadline = Date.now() + 10_000;
    let rows: { stored_orp_mv: number; incoming_orp_mv: number }[] = [];
    while (Date.now() < deadline) {
      rows = await rig.pool.query(`SELECT stored_orp_mv, incoming_orp_mv FROM reading_conflicts WHERE probe_id IN (${ids}) AND incoming_seq > 2000000`);
      if (rows.length >= changed.length) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    console.log(formatComparison('conflicting re-send', c), `conflict rows ${rows.length} of ${changed.length}`);
    expect(rows).toHaveLength(changed.length);
    expect(rows.every((r) => r.incoming_orp_mv === r.stored_orp_mv + 7)).toBe(true);
    // The checksum still matches the first values: nothing was overwritten.
    expect(c).toMatchObject({ lost: 0, duplicated: 0, ok: true, conflicts: changed.length });
  }, 30_000);
});
