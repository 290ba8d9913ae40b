import { parseArgs } from 'node:util';
import { z } from 'zod';

/** The simulator's environment, parsed once (it is not an api/ingest process, so it has its own). */
const envSchema = z.object({
  DATABASE_URL: z.string().regex(/^mariadb:\/\//, 'must start with mariadb://').optional(),
  MQTT_URL: z.string().regex(/^mqtts?:\/\//, 'must start with mqtt:// or mqtts://').default('mqtt://127.0.0.1:8472'),
  SIM_DEVICE_USER: z.string().default('sim-kestrel'),
  SIM_DEVICE_PASSWORD: z.string().min(1).optional(),
  SIM_SITE: z.string().default('kestrel'),
  SERVICE_MQTT_USER: z.string().default('ferrisight-service'),
  SERVICE_MQTT_PASSWORD: z.string().optional(),
});
export type SimEnv = z.infer<typeof envSchema>;

export function simEnv(env: NodeJS.ProcessEnv = process.env): SimEnv {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    throw new Error(`Invalid configuration:\n${parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n')}`);
  }
  return parsed.data;
}

export type SimArgs =
  | { mode: 'plant' }
  | { mode: 'fault'; fault: string; probeTag: string; clear: boolean }
  | { mode: 'load'; tanks: number; hz: number; batch: number; connections: number; durationS: number; site: string | undefined };

const USAGE = `usage:
  npm run sim                                   play the demo plant
  npm run sim -- --fault <name> --probe <tag> [--clear]
       faults: fouling flatline noisy comms-loss feed-upset pump-trip clear
  npm run sim -- --load --tanks N --hz M --batch B [--connections C] [--duration S] [--site TAG]`;

const positive = (name: string, v: string | undefined, dflt: number) => {
  const n = v === undefined ? dflt : Number(v);
  if (!Number.isFinite(n) || n <= 0) throw new Error(`--${name} must be a positive number\n${USAGE}`);
  return n;
};

export function parseSimArgs(argv: string[]): SimArgs {
  const { values } = parseArgs({
    args: argv,
    options: {
      fault: { type: 'string' }, probe: { type: 'string' }, clear: { type: 'boolean', default: false },
      load: { type: 'boolean', default: false }, tanks: { type: 'string' }, hz: { type: 'string' }, batch: { type: 'string' },
      connections: { type: 'string' }, duration: { type: 'string' }, site: { type: 'string' }, help: { type: 'boolean', default: false },
    },
  });
  if (values.help) throw new Error(USAGE);
  if (values.fault !== undefined) {
    if (!values.probe) throw new Error(`--fault needs --probe <tag>\n${USAGE}`);
    return { mode: 'fault', fault: values.fault, probeTag: values.probe, clear: values.clear ?? false };
  }
  if (values.load) {
    return {
      mode: 'load',
      tanks: Math.round(positive('tanks', values.tanks, 10)),
      hz: positive('hz', values.hz, 1),
      batch: Math.round(positive('batch', values.batch, 1)),
      connections: Math.round(positive('connections', values.connections, 1)),
      durationS: positive('duration', values.duration, 60),
      site: values.site,
    };
  }
  return { mode: 'plant' };
}
