import { createHash, timingSafeEqual } from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { Pool } from '../../api/src/db/pool.ts';
import { lookupsRepository, type DeviceRow } from '../../api/src/modules/readings/lookups.repository.ts';

/** Who a connected client is; devices are bound to one site, and to the Sparkplug groups Plant setup gave that site. */
export type Identity = { kind: 'service'; username: string } | { kind: 'device'; username: string; siteTag: string; sparkplugGroups: string[] };

type CacheEntry = { atMs: number; row: DeviceRow | null; verifiedSha256: Buffer | null };

const sha256 = (b: Buffer | string) => createHash('sha256').update(b).digest();

/** Constant-time equality of two secrets of any length (compares their SHA-256). */
export function secretsEqual(a: Buffer | string, b: Buffer | string): boolean {
  return timingSafeEqual(sha256(a), sha256(b));
}

// Group ids never contain '/', so it separates them.
const deviceIdentity = (username: string, row: DeviceRow): Identity => ({
  kind: 'device', username, siteTag: row.site_tag, sparkplugGroups: row.sparkplug_groups ? row.sparkplug_groups.split('/') : [],
});

/**
 * Checks MQTT credentials: the service account against its configured password, devices
 * against the devices table (bcrypt). Device rows are cached for ttlMs so a reconnect storm
 * does not become a query storm; a password once verified against a given hash is
 * remembered as its SHA-256, so bcrypt (~100 ms of CPU) runs once per device per hash.
 */
export class IdentityDirectory {
  private readonly cache = new Map<string, CacheEntry>();

  constructor(
    private readonly pool: Pool,
    private readonly service: { username: string; password: string },
    private readonly ttlMs = 30_000,
  ) {}

  /** The identity for these credentials, or null when they are wrong, unknown or disabled. */
  async verify(username: string | undefined, password: Buffer | undefined): Promise<Identity | null> {
    if (!username || !password) return null;
    if (username === this.service.username) {
      return this.service.password.length > 0 && secretsEqual(password, this.service.password)
        ? { kind: 'service', username } : null;
    }
    const entry = await this.lookup(username);
    if (!entry.row || !entry.row.enabled) return null;
    const digest = sha256(password);
    if (entry.verifiedSha256 && timingSafeEqual(entry.verifiedSha256, digest)) {
      return deviceIdentity(username, entry.row);
    }
    if (!(await bcrypt.compare(password.toString('utf8'), entry.row.password_hash))) return null;
    entry.verifiedSha256 = digest;
    return deviceIdentity(username, entry.row);
  }

  private async lookup(username: string): Promise<CacheEntry> {
    const hit = this.cache.get(username);
    if (hit && Date.now() - hit.atMs < this.ttlMs) return hit;
    const row = await lookupsRepository.device(this.pool, username);
    // Keep the verified digest only while the stored hash is unchanged (a password reset invalidates it).
    const verifiedSha256 = hit && row && hit.row?.password_hash === row.password_hash ? hit.verifiedSha256 : null;
    const entry = { atMs: Date.now(), row, verifiedSha256 };
    if (this.cache.size > 10_000) this.cache.clear(); // unknown usernames must not grow memory without bound
    this.cache.set(username, entry);
    return entry;
  }
}
