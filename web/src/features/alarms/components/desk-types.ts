import type { AlarmState } from '@shared/alarms/states';
import type { Role } from '@shared/schemas/auth';

/** A tank and where it sits, for filters and pickers (given by the route from the plant tree). */
export type Place = { siteTag: string; siteName: string; circuitId: number; circuitName: string; tankId: number; tankTag: string };

export type DeskContext = { role: Role; timeZone: string; places: Place[] };

export type DeskFilters = { site?: string; circuit?: number; tank?: number; priority?: number; state?: AlarmState };

export const ACK_ROLES: readonly Role[] = ['supervisor', 'engineer', 'admin'];
export const SERVICE_ROLES: readonly Role[] = ['metallurgist', 'admin'];
/** Who changes alarm definitions and applies templates (server: definitions.router.ts). */
export const SETTINGS_ROLES: readonly Role[] = ['metallurgist', 'admin'];
