/** Seeds the demo plant, users and simulator device, only when the database has no users. */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import bcrypt from 'bcryptjs';
import { referenceById } from '../shared/redox/index.ts';
import type { Role } from '../shared/schemas/auth.ts';
import { Calibration, Circuit, Device, Probe, Site, Tank, User, initModels } from '../api/src/db/models.ts';
import { createSequelize } from '../api/src/db/sequelize.ts';
import { BCRYPT_COST } from '../api/src/modules/auth/auth.service.ts';
import { firstRunRepository } from '../api/src/modules/first-run/first-run.repository.ts';
import { seedDemoAlarms } from './seed/demo-alarms.ts';
import { seedDemoHistory, type DemoHistorySummary } from './seed/demo-history.ts';
import { DEMO_CIRCUITS, DEMO_DEVICE, DEMO_SITE } from './seed/demo-plant.ts';

const here = path.dirname(fileURLToPath(import.meta.url));
type DemoUser = { role: Role; email: string; name: string; password: string };

/** history: also write a week of readings, alarms, assays, checks and shift log (npm start does; tests opt in). */
export type SeedOptions = { history?: boolean; now?: Date; onHistory?: (summary: DemoHistorySummary) => void };

export async function seedDemo(databaseUrl: string, simDevicePassword: string, options: SeedOptions = {}): Promise<boolean> {
  const sequelize = createSequelize(databaseUrl, 2);
  initModels(sequelize);
  try {
    if ((await User.count()) > 0) return false;
    const users: DemoUser[] = JSON.parse(fs.readFileSync(path.join(here, 'demo-users.json'), 'utf8'));
    const ref = referenceById('agcl-3m');
    const installedAt = new Date(Date.now() - 20 * 86_400_000);
    await sequelize.transaction(async (transaction) => {
      for (const u of users) {
        await User.create({ email: u.email, name: u.name, role: u.role, passwordHash: await bcrypt.hash(u.password, BCRYPT_COST), tokensValidAfter: new Date(0) }, { transaction });
      }
      const site = await Site.create(DEMO_SITE, { transaction });
      await Device.create({ siteId: site.id, username: DEMO_DEVICE.username, passwordHash: await bcrypt.hash(simDevicePassword, BCRYPT_COST) }, { transaction });
      for (const [ci, c] of DEMO_CIRCUITS.entries()) {
        const circuit = await Circuit.create({ siteId: site.id, tag: c.tag, name: c.name, position: ci, process: c.process }, { transaction });
        for (const [ti, t] of c.tanks.entries()) {
          const tank = await Tank.create({
            circuitId: circuit.id, tag: t.tag, name: t.name, position: ti, volumeM3: t.volumeM3,
            bandLow: t.band[0], bandHigh: t.band[1], bandTarget: t.band[2],
          }, { transaction });
          await Probe.create({
            tankId: tank.id, tag: `${t.tag}-ORP`, referenceId: ref.id, referenceE25V: ref.e25V, referenceCoeffVPerK: ref.coeffVPerK,
            toleranceMv: 10, intervalS: 5, installedAt,
          }, { transaction });
          await Calibration.create({
            tankId: tank.id, version: 1, formalPotentialV: c.formalPotentialV, formalCoeffVPerK: c.formalCoeffVPerK,
            validFrom: installedAt, reason: 'Commissioning calibration from the first assay campaign (demo)', createdBy: null,
          }, { transaction });
        }
      }
      await seedDemoAlarms(sequelize, transaction);
    });
    if (options.history) options.onHistory?.(await seedDemoHistory(sequelize, databaseUrl, options.now?.getTime()));
    return true;
  } finally {
    await sequelize.close();
  }
}

/**
 * A real site (DEMO=off): no demo plant and no demo users. While the database has no users,
 * each start writes a fresh one-time link for creating the first admin to
 * FERRISIGHT_DATA_DIR/first-run-link.txt (the start banner prints it); once someone exists, the file goes.
 */
export async function prepareFirstRun(databaseUrl: string, publicUrl: string, dataDir: string): Promise<string | null> {
  const sequelize = createSequelize(databaseUrl, 1);
  initModels(sequelize);
  const file = path.join(dataDir, 'first-run-link.txt');
  try {
    const token = await firstRunRepository.issueToken(sequelize);
    if (!token) {
      fs.rmSync(file, { force: true });
      return null;
    }
    const link = `${publicUrl.replace(/\/$/, '')}/first-run#token=${token}`;
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, `${link}\n`, { mode: 0o600 });
    return link;
  } finally {
    await sequelize.close();
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const url = process.env.DATABASE_URL;
  const pw = process.env.SIM_DEVICE_PASSWORD;
  if (url && process.env.DEMO === 'off') {
    const publicUrl = process.env.PUBLIC_URL ?? `http://127.0.0.1:${process.env.PORT ?? 8470}`;
    const link = await prepareFirstRun(url, publicUrl, process.env.FERRISIGHT_DATA_DIR ?? '.data');
    process.stdout.write(link ? 'seed: no demo data (DEMO=off); the first admin is created with a one-time link\n' : 'seed: no demo data (DEMO=off)\n');
    process.exit(0);
  }
  if (!url || !pw) {
    process.stderr.write('DATABASE_URL and SIM_DEVICE_PASSWORD must be set\n');
    process.exit(1);
  }
  const seeded = await seedDemo(url, pw, {
    history: process.env.DEMO_HISTORY !== 'off',
    onHistory: (h) => process.stdout.write(`seed: a week of history: ${h.readings} readings, ${h.assays} assays, ${h.probeChecks} probe checks, ${h.alarmActions} alarm events, ${h.logEntries} log entries (${(h.ms / 1000).toFixed(1)} s)\n`),
  });
  process.stdout.write(seeded ? 'seed: demo plant Kestrel Flats created\n' : 'seed: database already has data, left as is\n');
}
