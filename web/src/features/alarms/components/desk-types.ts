import type { AlarmState } from '@shared/alarms/states';
import type { Role } from '@shared/schemas/auth';
import type { TankLive } from '@shared/schemas/readings';

/** A tank and where it sits, for filters and pickers, with its newest values (given by the route from the live plant tree). */
export type Place = { siteTag: string; siteName: string; circuitId: number; circuitName: string; tankId: number; tankTag: string; latest: TankLive | null };

export type DeskContext = { role: Role; timeZone: string; places: Place[] };

export type DeskFilters = { site?: string; circuit?: number; tank?: number; priority?: number; state?: AlarmState };

export { ACK_ROLES, SERVICE_ROLES } from '@shared/alarms/roles';
/** Who changes alarm definitions and applies templates (server: definitions.router.ts). */
export const SETTINGS_ROLES: readonly Role[] = ['metallurgist', 'admin'];
