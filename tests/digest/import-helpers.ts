import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import type { ImportJobView } from '../../shared/schemas/import.ts';
import type { TestApi } from '../helpers/api.ts';

const made: string[] = [];

/** A private temporary folder, removed by removeTempFiles() (call it in afterAll). */
export function tempDir(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fs-import-'));
  made.push(dir);
  return dir;
}

export function removeTempFiles(): void {
  for (const dir of made.splice(0)) fs.rmSync(dir, { recursive: true, force: true });
}

/**
 * Writes a historical-import file of `rows` readings: probes interleaved in time order (as a
 * historian exports them), 5 s apart per probe, starting at startMs. Written in chunks, so a
 * million rows never sit in memory as one string.
 */
export async function writeReadingsFile(rows: number, probeTags: string[], startMs: number): Promise<string> {
  const file = path.join(tempDir(), `readings-${rows}.csv`);
  const out = fs.createWriteStream(file);
  const write = (s: string) => (out.write(s) ? Promise.resolve() : new Promise<void>((r) => out.once('drain', () => r())));
  await write('probe,time,ORP (mV),Temperature (°C)\n');
  let lines: string[] = [];
  for (let i = 0; i < rows; i += 1) {
    const step = Math.floor(i / probeTags.length);
    const tag = probeTags[i % probeTags.length];
    const orp = 440 + 20 * Math.sin(step / 500) + (i % 7) * 0.01;
    lines.push(`${tag},${new Date(startMs + step * 5000).toISOString()},${orp.toFixed(2)},${(42 + (step % 10) / 10).toFixed(1)}`);
    if (lines.length === 10_000) {
      await write(lines.join('\n') + '\n');
      lines = [];
    }
  }
  await write(lines.join('\n') + (lines.length ? '\n' : ''));
  await new Promise<void>((resolve, reject) => out.end((err?: Error | null) => (err ? reject(err) : resolve())));
  return file;
}

/** Uploads a file as the given user and waits for its job to finish. */
export async function importFile(t: TestApi, file: string, role: 'metallurgist' | 'admin' = 'metallurgist', timeoutMs = 600_000): Promise<ImportJobView> {
  const res = await request(t.app).post('/api/readings/imports').set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').attach('file', file);
  if (res.status !== 202) throw new Error(`upload refused: ${res.status} ${JSON.stringify(res.body)}`);
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const job: ImportJobView = (await request(t.app).get(`/api/readings/imports/${res.body.job.id}`).set('Cookie', t.cookies[role])).body.job;
    if (job.status === 'done' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`import ${job.id} still ${job.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Totals that change if any reading or rollup changes. */
export async function fingerprint(t: TestApi): Promise<Record<string, number>> {
  const [row] = await t.sequelize.query<Record<string, number>>(`SELECT
      (SELECT COUNT(*) FROM readings) AS readings, (SELECT COALESCE(SUM(orp_mv), 0) FROM readings) AS orpSum,
      (SELECT COUNT(*) FROM rollups_1m) AS minutes, (SELECT COALESCE(SUM(n), 0) FROM rollups_1m) AS minuteN,
      (SELECT COALESCE(SUM(orp_mean * n), 0) FROM rollups_1m) AS minuteOrp,
      (SELECT COUNT(*) FROM rollups_1h) AS hours, (SELECT COALESCE(SUM(n), 0) FROM rollups_1h) AS hourN,
      (SELECT COUNT(*) FROM reading_conflicts) AS conflicts`, { type: QueryTypes.SELECT });
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)]));
}
