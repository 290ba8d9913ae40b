/**
 * Plant simulator: plays the demo plant as a registered device, sends fault commands,
 * or generates benchmark load. See `npm run sim -- --help`.
 */
import mqtt from 'mqtt';
import { createLogger } from '../api/src/lib/logger.ts';
import { parseSimArgs, simEnv, type SimArgs, type SimEnv } from './plant/config.ts';
import { SIM_COMMAND_TOPIC } from '../shared/schemas/internal-topics.ts';
import { simCommandSchema } from '../shared/schemas/simulator.ts';
import { runLoad } from './plant/load.ts';
import { ensureLoadProbes } from './plant/load-probes.ts';
import { loadSimProbes } from './plant/plant-db.ts';
import { runPlant } from './plant/plant-runner.ts';

const log = createLogger('sim');
const say = (line: string) => process.stdout.write(`${line}\n`);

function need(value: string | undefined, name: string): string {
  if (!value) throw new Error(`Invalid configuration:\n  ${name}: required for this mode`);
  return value;
}

async function sendFault(env: SimEnv, args: Extract<SimArgs, { mode: 'fault' }>): Promise<void> {
  const cmd = simCommandSchema.parse({ fault: args.fault, probeTag: args.probeTag, action: args.clear ? 'clear' : 'start' });
  const client = await mqtt.connectAsync(env.MQTT_URL, {
    username: env.SERVICE_MQTT_USER, password: need(env.SERVICE_MQTT_PASSWORD, 'SERVICE_MQTT_PASSWORD'),
    clientId: `ferrisight-sim-cli-${process.pid}`, protocolVersion: 4, reconnectPeriod: 0,
  });
  await client.publishAsync(SIM_COMMAND_TOPIC, JSON.stringify(cmd), { qos: 1 });
  await client.endAsync();
  say(`sent ${JSON.stringify(cmd)}`);
}

async function load(env: SimEnv, args: Extract<SimArgs, { mode: 'load' }>): Promise<void> {
  const site = args.site ?? env.SIM_SITE;
  // The service account may publish for any site; a device only for its own.
  const creds = env.SERVICE_MQTT_PASSWORD
    ? { username: env.SERVICE_MQTT_USER, password: env.SERVICE_MQTT_PASSWORD }
    : { username: env.SIM_DEVICE_USER, password: need(env.SIM_DEVICE_PASSWORD, 'SIM_DEVICE_PASSWORD') };
  if (env.DATABASE_URL) say(`load probes created: ${await ensureLoadProbes(env.DATABASE_URL, site, args.tanks)}`);
  const res = await runLoad({
    mqttUrl: env.MQTT_URL, ...creds, siteTag: site, tanks: args.tanks, hz: args.hz, batch: args.batch,
    connections: args.connections, durationS: args.durationS,
    onProgress: (p) => say(`t=${p.elapsedS.toFixed(1)}s sent ${p.sentMessages} msgs / ${p.sentReadings} readings, acked ${p.ackedMessages}`),
  });
  say(`done: sent ${res.sentMessages} msgs / ${res.sentReadings} readings in ${res.elapsedS.toFixed(1)} s, acked ${res.ackedMessages}; seq ${res.seqStart}…${res.seqStart + Math.round(args.durationS * args.hz) - 1} per probe`);
}

async function plant(env: SimEnv): Promise<void> {
  const probes = await loadSimProbes(need(env.DATABASE_URL, 'DATABASE_URL'), env.SIM_SITE);
  if (probes.length === 0) throw new Error(`site '${env.SIM_SITE}' has no active probes: run the seed first`);
  const running = runPlant({
    mqttUrl: env.MQTT_URL, siteTag: env.SIM_SITE, probes, log,
    device: { username: env.SIM_DEVICE_USER, password: need(env.SIM_DEVICE_PASSWORD, 'SIM_DEVICE_PASSWORD') },
    service: env.SERVICE_MQTT_PASSWORD ? { username: env.SERVICE_MQTT_USER, password: env.SERVICE_MQTT_PASSWORD } : undefined,
  });
  if (!env.SERVICE_MQTT_PASSWORD) log.warn('SERVICE_MQTT_PASSWORD not set: fault commands are not received');
  log.info({ site: env.SIM_SITE, probes: probes.map((p) => p.probeTag) }, 'simulator running');
  const shutdown = async () => {
    await running.stop();
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown());
  process.on('SIGINT', () => void shutdown());
}

async function main(): Promise<void> {
  const args = parseSimArgs(process.argv.slice(2));
  const env = simEnv();
  if (args.mode === 'fault') return sendFault(env, args);
  if (args.mode === 'load') return load(env, args);
  return plant(env);
}

main().catch((err: Error) => {
  process.stderr.write(`${err.message}\n`);
  process.exit(1);
});
