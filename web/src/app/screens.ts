import { ROLES, type Role } from '@shared/schemas/auth';

/** group: screens shown together under one header menu (the metallurgist's workbench). */
export type Screen = { path: string; name: string; roles: readonly Role[]; built: boolean; group?: 'workbench' };

/** Every screen, who may open it, and whether it exists yet. The server enforces roles; this only hides. */
export const SCREENS = {
  floor: { path: '/', name: 'Floor', roles: ROLES, built: true },
  alarms: { path: '/alarm-desk', name: 'Alarm desk', roles: ROLES, built: true },
  // Supervisors open Bands to approve large changes (a second person); only metallurgists and admins change.
  bands: { path: '/bands', name: 'Bands', roles: ['supervisor', 'metallurgist', 'admin'], built: true, group: 'workbench' },
  assays: { path: '/assays', name: 'Assays', roles: ['metallurgist', 'admin'], built: true, group: 'workbench' },
  calibration: { path: '/calibration', name: 'Calibration', roles: ['metallurgist', 'admin'], built: true, group: 'workbench' },
  dose: { path: '/dose-advisor', name: 'Dose advisor', roles: ['metallurgist', 'admin'], built: true, group: 'workbench' },
  // Everyone may see who is on call; supervisors and admins change it (the server enforces).
  roster: { path: '/call-roster', name: 'Call roster', roles: ROLES, built: true },
  digest: { path: '/shift-digest', name: 'Shift digest', roles: ['supervisor', 'metallurgist', 'admin'], built: true },
  shiftLog: { path: '/shift-log', name: 'Shift log', roles: ROLES, built: true },
  // Engineers look after probes and gateways; sites, circuits, tanks and people are the admins'.
  setup: { path: '/plant-setup', name: 'Plant setup', roles: ['admin', 'engineer'], built: true },
} as const satisfies Record<string, Screen>;

/** Plant setup's ingest health panel (workers' heartbeats, parts and restarts): admins only, like its API. */
export const PLANT_HEALTH_PATH = `${SCREENS.setup.path}?tab=people#ingest-health`;

export function canOpen(role: Role | undefined, screen: Screen): boolean {
  return !!role && screen.roles.includes(role);
}

export const GROUP_NAMES = { workbench: 'Workbench' } as const;

/** The nav shows built screens the role may open; later ones keep their routes but stay out of the way. */
export function navFor(role: Role | undefined): Screen[] {
  return Object.values(SCREENS).filter((s: Screen) => s.built && canOpen(role, s));
}
