/**
 * npm run soak — the long form of the reliability suite: every fault test with its
 * full figures (10 worker kills, 30 s MariaDB outage, 5 broker kills, 30 s socket outage,
 * 5 min SMTP outage, 10,000 hostile payloads with the latency assertion) plus the 2,000 readings/s soak
 * (tests/reliability/soak.test.ts), one file at a time so the figures are not shared-CPU noise.
 *
 * Settings: SOAK_MINUTES=30 (the soak stream); extra arguments go to vitest, e.g.
 *   SOAK_MINUTES=5 npm run soak -- tests/reliability/soak.test.ts
 * Like npm test it starts a throw-away MariaDB (scripts/test.sh) and prints every comparison.
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const minutes = Number(process.env.SOAK_MINUTES ?? 30);
if (!Number.isFinite(minutes) || minutes <= 0) {
  process.stderr.write(`SOAK_MINUTES=${process.env.SOAK_MINUTES} must be a positive number of minutes\n`);
  process.exit(1);
}
const args = process.argv.slice(2);
const targets = args.filter((a) => !a.startsWith('-'));
const child = spawn('bash', ['scripts/test.sh', ...(targets.length ? [] : ['tests/reliability']), ...args, '--no-file-parallelism', '--reporter=verbose'], {
  cwd: ROOT, stdio: 'inherit', env: { ...process.env, FERRISIGHT_LONG: '1', SOAK_MINUTES: String(minutes) },
});
process.stdout.write(`soak: long-form reliability suite, soak stream ${minutes} min (expect about ${Math.round(minutes + 15)} min in all)\n`);
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => child.kill(sig));
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 130 : 1)));
