/**
 * The people in the demo week's record. The demo supervisor and operator work one crew; the
 * other crew's supervisor (from the call roster) and operator are users too, so their handovers
 * and log entries carry real authors. Their passwords are random and never shown: nobody signs
 * in as them. All invented; e-mails @kestrel.example.
 */
import { randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { QueryTypes } from 'sequelize';
import type { Role } from '../../shared/schemas/auth.ts';
import { User } from '../../api/src/db/models.ts';
import { BCRYPT_COST } from '../../api/src/modules/auth/auth.service.ts';
import { wallTimeOf } from '../../shared/time/site-time.ts';

export type Person = { id: number; name: string };
type Crew = { operator: Person; supervisor: Person };
export type DemoPeople = {
  /** Two crews take turns on 12-hour shifts: the sign-in crew and the night crew of the roster. */
  crews: [Crew, Crew];
  /** A shift that crews[0] works (the supervisor roster's rotation), and the shift length. */
  rotation: { anchorMs: number; shiftMs: number } | null;
  metallurgist: Person;
  engineer: Person;
  admin: Person;
};

const OTHER_CREW: Array<{ role: Role; email: string; name: string }> = [
  { role: 'supervisor', email: 'mirela.haas@kestrel.example', name: 'Mirela Haas' },
  { role: 'operator', email: 'kaito.brennan@kestrel.example', name: 'Kaito Brennan' },
];

async function byEmail(email: string): Promise<Person> {
  const u = await User.findOne({ where: { email } });
  if (!u) throw new Error(`demo history: user ${email} is missing`);
  return { id: u.id, name: u.name };
}

const SHIFT_MS = 12 * 3_600_000;

/** The supervisor rotation of the call roster (seed/demo-alarms.ts), so the log agrees with it. */
async function rosterRotation(): Promise<DemoPeople['rotation']> {
  const [first] = await User.sequelize!.query<{ starts_at: Date; email: string }>(
    "SELECT starts_at, email FROM roster_shifts WHERE role_on_call = 'supervisor' ORDER BY starts_at LIMIT 1", { type: QueryTypes.SELECT });
  if (!first) return null;
  const start = new Date(first.starts_at).getTime();
  return { anchorMs: first.email === 'supervisor@kestrel.example' ? start : start + SHIFT_MS, shiftMs: SHIFT_MS };
}

export async function ensureDemoPeople(): Promise<DemoPeople> {
  for (const p of OTHER_CREW) {
    if (await User.findOne({ where: { email: p.email } })) continue;
    const passwordHash = await bcrypt.hash(randomBytes(24).toString('base64url'), BCRYPT_COST);
    await User.create({ email: p.email, name: p.name, role: p.role, passwordHash, tokensValidAfter: new Date(0) });
  }
  return {
    crews: [
      { operator: await byEmail('operator@kestrel.example'), supervisor: await byEmail('supervisor@kestrel.example') },
      { operator: await byEmail('kaito.brennan@kestrel.example'), supervisor: await byEmail('mirela.haas@kestrel.example') },
    ],
    rotation: await rosterRotation(),
    metallurgist: await byEmail('metallurgist@kestrel.example'),
    engineer: await byEmail('engineer@kestrel.example'),
    admin: await byEmail('admin@kestrel.example'),
  };
}

/**
 * Who is on shift at an instant: the roster's rotation carried back over the week, or (with no
 * roster) the sign-in crew on days, 06:00–18:00 site time.
 */
export function crewAt(people: DemoPeople, utcMs: number, timeZone: string): Crew {
  const r = people.rotation;
  if (!r) {
    const hour = wallTimeOf(utcMs, timeZone).hour;
    return people.crews[hour >= 6 && hour < 18 ? 0 : 1];
  }
  const k = Math.floor((utcMs - r.anchorMs) / r.shiftMs);
  return people.crews[((k % 2) + 2) % 2];
}
