import { z } from 'zod';

const isoSchema = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 time with Z or an offset' });
export const EXPORT_SOURCES = ['raw', '1m', '1h'] as const;
export type ExportSource = (typeof EXPORT_SOURCES)[number];
export const MAX_EXPORT_DAYS = 366;

/** Readings export: tanks as "1,2,3", a range, and raw readings or a rollup table. */
export const exportQuerySchema = z
  .object({
    tankIds: z
      .string({ message: 'Choose at least one tank' })
      .regex(/^\d+(,\d+)*$/, 'tankIds is a comma-separated list of tank ids')
      .transform((s) => [...new Set(s.split(',').map(Number))])
      .refine((ids) => ids.length <= 100, 'At most 100 tanks'),
    from: isoSchema,
    to: isoSchema,
    source: z.enum(EXPORT_SOURCES).default('1m'),
  })
  .refine((v) => Date.parse(v.from) < Date.parse(v.to), { message: 'from must be before to', path: ['from'] })
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= MAX_EXPORT_DAYS * 86_400_000, {
    message: `At most ${MAX_EXPORT_DAYS} days per file`, path: ['to'],
  });
export type ExportQuery = z.infer<typeof exportQuerySchema>;

/** Headers carry their unit as a suffix (orp_mv, temp_c, eh_v); dimensionless columns name the quantity (ratio_fe3_fe2). */
export const RAW_EXPORT_COLUMNS = [
  'tank', 'probe', 'ts_utc', 'orp_mv', 'temp_c', 'eh_v', 'ratio_fe3_fe2', 'ferric_fraction', 'flag', 'calibration_version',
] as const;
export const ROLLUP_EXPORT_COLUMNS = [
  'tank', 'probe', 'bucket_start_utc', 'readings_n',
  'orp_mean_mv', 'orp_min_mv', 'orp_max_mv', 'eh_mean_v', 'eh_min_v', 'eh_max_v',
  'temp_mean_c', 'temp_min_c', 'temp_max_c', 'ratio_geomean_fe3_fe2', 'ratio_min_fe3_fe2', 'ratio_max_fe3_fe2',
] as const;
