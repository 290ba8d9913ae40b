import type { Role } from '../schemas/auth.ts';

/**
 * Who may do what with an alarm. The operator is the first responder (ISA-18.2), so every
 * signed-in role that watches the plant acknowledges. Shelving hides an alarm for a while, so it
 * is a site decision: supervisors, engineers and admins always, operators only where the site
 * allows it (site setting operatorsMayShelve). Shared by the API (enforces) and the Alarm desk (offers).
 */
export const ACK_ROLES: readonly Role[] = ['operator', 'supervisor', 'engineer', 'admin'];
const SHELVE_ALWAYS: readonly Role[] = ['supervisor', 'engineer', 'admin'];
/** Out of service is a maintenance decision. */
export const SERVICE_ROLES: readonly Role[] = ['metallurgist', 'admin'];

export type ShelveRule = { operatorsMayShelve: number; maxShelveHours: number };

/** A plant-wide alarm has no site whose setting applies: operators may not shelve it, and the 12 h ceiling holds. */
export const PLANT_SHELVE_RULE: ShelveRule = { operatorsMayShelve: 0, maxShelveHours: 12 };

export function mayShelve(role: Role, rule: Pick<ShelveRule, 'operatorsMayShelve'>): boolean {
  return SHELVE_ALWAYS.includes(role) || (role === 'operator' && rule.operatorsMayShelve === 1);
}

/** Every role that might shelve under some site setting: the route's gate; the service applies the setting. */
export const SHELVE_GATE: readonly Role[] = ['operator', ...SHELVE_ALWAYS];
