import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createIngestPool } from '../../api/src/db/pool.ts';
import { convertReading } from '../../api/src/modules/readings/convert.ts';
import { ProbeCache } from '../../api/src/modules/readings/probe-cache.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { as, insertReadings, probeOf } from './helpers.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

/** Converts one reading of the probe with the ingest worker's own cache, freshly loaded. */
async function flagNow(probeTag: string): Promise<string> {
  const pool = createIngestPool(t.databaseUrl, 1);
  try {
    const cache = new ProbeCache(pool);
    await cache.reload();
    const out = convertReading(
      { siteTag: 'kestrel', probeTag, ts: new Date().toISOString(), orpMv: 430, tempC: 43, seq: 1, index: null },
      cache, { receivedAtMs: Date.now(), retentionDays: 90 },
    );
    if (typeof out === 'string') throw new Error(out);
    return out.flag;
  } finally {
    await pool.end();
  }
}

describe('suspect probes', () => {
  it('when a probe fails its check, then its readings are marked suspect until it passes one', async () => {
    const probe = await probeOf(t, 'A4');
    await insertReadings(t, probe.id, [{ tsMs: Date.now() - 60_000, orpMv: 430, tempC: 43, ratio: 12 }, { tsMs: Date.now() - 5_000, orpMv: 431, tempC: 43, ratio: 12.5 }]);
    expect(await flagNow('A4-ORP')).toBe('ok');
    // Light's solution, 0.675 V vs SHE at 25 °C (Standard Methods 2580; ASTM D1498): about +465 mV against 3 M KCl.
    const failed = await as(t, 'metallurgist').post('/api/probe-checks', { probeId: probe.id, standard: 'light', tempC: 25, readingMv: 452 });
    expect(failed.body.check.pass).toBe(false);
    expect(await flagNow('A4-ORP')).toBe('probe-suspect');
    // The newest stored reading is marked at once, so the screens need not wait for the next one.
    const [newest] = await t.sequelize.query<{ flag: string }>(
      `SELECT flag FROM readings WHERE probe_id = ${probe.id} ORDER BY ts DESC LIMIT 1`, { type: QueryTypes.SELECT });
    expect(newest.flag).toBe('probe-suspect');
    const older = await t.sequelize.query<{ flag: string }>(`SELECT flag FROM readings WHERE probe_id = ${probe.id} ORDER BY ts`, { type: QueryTypes.SELECT });
    expect(older.map((r) => r.flag)).toEqual(['ok', 'probe-suspect']);
    const passed = await as(t, 'metallurgist').post('/api/probe-checks', { probeId: probe.id, standard: 'light', tempC: 25, readingMv: failed.body.check.expectedMv });
    expect(passed.body.check.pass).toBe(true);
    expect(await flagNow('A4-ORP')).toBe('ok');
  });

  it('when a probe that failed its check is replaced, then its readings are no longer suspect', async () => {
    const probe = await probeOf(t, 'A5');
    await as(t, 'metallurgist').post('/api/probe-checks', { probeId: probe.id, standard: 'light', tempC: 25, readingMv: 300 });
    expect(await flagNow('A5-ORP')).toBe('probe-suspect');
    const res = await as(t, 'metallurgist').post('/api/probe-checks/replacements', { probeId: probe.id, part: 'reference', replacedAt: new Date().toISOString(), reason: 'Junction blocked' });
    expect(res.status).toBe(201);
    expect(await flagNow('A5-ORP')).toBe('ok');
  });
});
