import { QueryTypes, type Transaction } from 'sequelize';
import {
  SITE_SETTING_KEYS, SITE_SETTINGS, defaultSiteSettings, type SiteSettingKey, type SiteSettings, type SiteSettingsResponse,
  type UpdateSettingInput,
} from '../../../../shared/schemas/workbench.ts';
import { Site } from '../../db/models.ts';
import { SiteSetting } from '../../db/workbench-models.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import { writeAudit } from '../audit.repository.ts';

function merge(rows: SiteSetting[]): SiteSettings {
  const out = defaultSiteSettings();
  for (const r of rows) {
    const key = r.key as SiteSettingKey;
    if (!SITE_SETTING_KEYS.includes(key)) continue;
    const parsed = SITE_SETTINGS[key].schema.safeParse(r.value);
    // A bad stored value must not switch change control off: fall back to the default, loudly.
    if (parsed.success) out[key] = parsed.data;
    else logger.warn({ siteId: r.siteId, key, value: r.value }, 'invalid site setting ignored, default used');
  }
  return out;
}

export const siteSettingsRepository = {
  /** Pass the caller's transaction when inside one: a second pool connection per request deadlocks under load. */
  async forSite(siteId: number, transaction?: Transaction): Promise<SiteSettings> {
    return merge(await SiteSetting.findAll({ where: { siteId }, transaction }));
  },

  /** Settings of the site a tank belongs to; 404 when the tank does not exist. */
  async forTank(tankId: number, transaction?: Transaction): Promise<SiteSettings & { siteId: number }> {
    const rows = await Site.sequelize!.query<{ siteId: number }>(
      'SELECT c.site_id AS siteId FROM tanks t JOIN circuits c ON c.id = t.circuit_id WHERE t.id = :tankId',
      { replacements: { tankId }, type: QueryTypes.SELECT, transaction },
    );
    if (!rows[0]) throw AppError.notFound('Tank');
    return { ...(await this.forSite(rows[0].siteId, transaction)), siteId: rows[0].siteId };
  },

  async all(): Promise<SiteSettingsResponse> {
    const [sites, rows] = await Promise.all([Site.findAll({ order: [['tag', 'ASC']] }), SiteSetting.findAll()]);
    return {
      sites: sites.map((s) => ({ siteId: s.id, siteTag: s.tag, settings: merge(rows.filter((r) => r.siteId === s.id)) })),
    };
  },

  async update(input: UpdateSettingInput, userId: number): Promise<SiteSettings> {
    if (!(await Site.findByPk(input.siteId))) throw AppError.notFound('Site');
    await Site.sequelize!.transaction(async (transaction) => {
      const before = await this.forSite(input.siteId);
      await SiteSetting.upsert({ siteId: input.siteId, key: input.key, value: input.value, updatedBy: userId, updatedAt: new Date() }, { transaction });
      await writeAudit({
        userId, action: 'settings.update', entity: 'site', entityId: input.siteId,
        before: { [input.key]: before[input.key] }, after: { [input.key]: input.value }, reason: input.reason,
      }, transaction);
    });
    return this.forSite(input.siteId);
  },
};
