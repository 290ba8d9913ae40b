import { z } from 'zod';

/**
 * Site settings of the metallurgist's workbench. Each key has its own range, so a value typed
 * into Plant setup is checked by the same rule the API applies when it reads the table.
 */
export const SITE_SETTINGS = {
  /** A band change moving either bound by more than this factor needs a second person. */
  bandApprovalFactor: { schema: z.number().min(1.01).max(100), default: 2, label: 'Band change needing approval (factor)', unit: '×' },
  /** Band changes within this many hours add up: the factor is judged against the band in force at the window's start. */
  bandApprovalWindowH: { schema: z.number().min(0).max(720), default: 24, label: 'Band changes add up over', unit: 'h' },
  /** Readings within ± this many minutes of an assay's sampling time are matched to it. */
  assayMatchWindowMin: { schema: z.number().min(0.5).max(240), default: 10, label: 'Assay match window', unit: 'min' },
  /** The temperature coefficient is fitted only when the assays span at least this much. */
  calibrationMinTempSpanC: { schema: z.number().min(1).max(100), default: 5, label: 'Temperature span to fit k', unit: '°C' },
  /** Default interval between probe checks when a probe has none of its own. */
  probeCheckIntervalDays: { schema: z.number().min(0.5).max(365), default: 7, label: 'Probe check interval', unit: 'days' },
  /** 1: operators may shelve alarms too; 0: supervisors, engineers and admins only. */
  operatorsMayShelve: { schema: z.number().int().min(0).max(1), default: 0, label: 'Operators may shelve alarms (1 yes, 0 no)', unit: '' },
  /** Longest shelve the site allows; never more than the 12 h ceiling. */
  maxShelveHours: { schema: z.number().min(0.25).max(12), default: 12, label: 'Longest shelve', unit: 'h' },
} as const;

export type SiteSettingKey = keyof typeof SITE_SETTINGS;
export const SITE_SETTING_KEYS = Object.keys(SITE_SETTINGS) as SiteSettingKey[];
export type SiteSettings = Record<SiteSettingKey, number>;

export function defaultSiteSettings(): SiteSettings {
  return Object.fromEntries(SITE_SETTING_KEYS.map((k) => [k, SITE_SETTINGS[k].default])) as SiteSettings;
}

export const reasonSchema = z.string().trim().min(3, 'Give a reason (at least 3 characters)').max(500, 'At most 500 characters');

export const updateSettingSchema = z
  .object({
    siteId: z.number().int().positive(),
    key: z.enum(SITE_SETTING_KEYS as [SiteSettingKey, ...SiteSettingKey[]]),
    value: z.number().finite(),
    reason: reasonSchema,
  })
  .superRefine((v, ctx) => {
    const r = SITE_SETTINGS[v.key].schema.safeParse(v.value);
    if (!r.success) ctx.addIssue({ code: 'custom', path: ['value'], message: r.error.issues[0]?.message ?? 'Out of range' });
  });
export type UpdateSettingInput = z.infer<typeof updateSettingSchema>;

export type SiteSettingsResponse = { sites: Array<{ siteId: number; siteTag: string; settings: SiteSettings }> };

/** ISO 8601 instant with Z or an offset, as every workbench endpoint takes times. */
export const instantSchema = z.iso.datetime({ offset: true, message: 'Enter a date and time (ISO 8601 with Z or an offset)' });

/** Allowed clock difference between a lab PC and the server before a time counts as future. */
export const FUTURE_SKEW_MS = 5 * 60_000;
