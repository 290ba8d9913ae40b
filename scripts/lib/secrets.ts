import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** Generated once per installation and kept in .data/secrets.json (mode 600). */
export interface Secrets {
  JWT_SECRET: string;
  SERVICE_MQTT_PASSWORD: string;
  MARIADB_APP_PASSWORD: string;
  SIM_DEVICE_PASSWORD: string;
}

const generators: Record<keyof Secrets, () => string> = {
  JWT_SECRET: () => randomBytes(48).toString('base64url'),
  SERVICE_MQTT_PASSWORD: () => randomBytes(24).toString('base64url'),
  MARIADB_APP_PASSWORD: () => randomBytes(24).toString('base64url'),
  SIM_DEVICE_PASSWORD: () => randomBytes(24).toString('base64url'),
};

/** Makes a private directory (mode 700) and its parents. */
export function ensurePrivateDir(dir: string): void {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  chmodSync(dir, 0o700);
}

/** Reads dataDir/secrets.json, adds any missing secret, and writes it back when it changed. */
export function loadSecrets(dataDir: string): Secrets {
  ensurePrivateDir(dataDir);
  const file = path.join(dataDir, 'secrets.json');
  let stored: Partial<Record<string, unknown>> = {};
  if (existsSync(file)) {
    try {
      stored = JSON.parse(readFileSync(file, 'utf8')) as Record<string, unknown>;
    } catch {
      throw new Error(`${file} is not valid JSON: fix or delete it (deleting it makes new passwords)`);
    }
  }
  let changed = false;
  const out = { ...stored } as Record<string, unknown>;
  for (const key of Object.keys(generators) as (keyof Secrets)[]) {
    if (typeof out[key] !== 'string' || (out[key] as string).length < 16) {
      out[key] = generators[key]();
      changed = true;
    }
  }
  if (changed) {
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(out, null, 2) + '\n', { mode: 0o600 });
    renameSync(tmp, file);
  }
  chmodSync(file, 0o600);
  return out as unknown as Secrets;
}
