import { QueryTypes, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import { KIND_INFO, limitFor, type TankAlarmKind } from '../../../../shared/alarms/kinds.ts';
import type { DefinitionSettings, DefinitionView } from '../../../../shared/schemas/alarms.ts';
import { Site } from '../../db/models.ts';

/** Alarm definitions: read with the tank's live band, written with the caller's transaction. */
type Row = {
  id: number; tank_id: number; tank_tag: string; kind: TankAlarmKind; priority: number; threshold: number | null; deadband: number;
  on_delay_s: number; off_delay_s: number; window_s: number | null; cause: string; consequence: string; action: string;
  response_min: number; band_low: number; band_high: number; updated_at: Date;
};

const SELECT = `SELECT d.*, t.tag AS tank_tag, t.band_low, t.band_high FROM alarm_definitions d JOIN tanks t ON t.id = d.tank_id`;

function toView(r: Row): DefinitionView {
  const info = KIND_INFO[r.kind];
  return {
    id: r.id, tankId: r.tank_id, tankTag: r.tank_tag, kind: r.kind, label: info.label, unit: info.unit, deadbandUnit: info.deadbandUnit,
    priority: r.priority, threshold: r.threshold, deadband: r.deadband, onDelayS: r.on_delay_s, offDelayS: r.off_delay_s, windowS: r.window_s,
    rationalisation: { cause: r.cause, consequence: r.consequence, action: r.action, responseMin: r.response_min },
    limit: limitFor(r.kind, r.threshold, { low: r.band_low, high: r.band_high }),
    updatedAt: new Date(r.updated_at).toISOString(),
  };
}

function columns(s: DefinitionSettings) {
  return {
    priority: s.priority, threshold: s.threshold, deadband: s.deadband, on_delay_s: s.onDelayS, off_delay_s: s.offDelayS,
    window_s: s.windowS, cause: s.rationalisation.cause, consequence: s.rationalisation.consequence,
    action: s.rationalisation.action, response_min: s.rationalisation.responseMin,
  };
}

export const definitionsRepository = {
  async list(sequelize: Sequelize, tankId?: number): Promise<DefinitionView[]> {
    const rows = await sequelize.query<Row>(`${SELECT} ${tankId ? 'WHERE d.tank_id = :tankId' : ''} ORDER BY t.id, d.id`,
      { replacements: { tankId }, type: QueryTypes.SELECT });
    return rows.map(toView);
  },

  async get(sequelize: Sequelize, id: number, transaction?: Transaction): Promise<DefinitionView | null> {
    const [row] = await sequelize.query<Row>(`${SELECT} WHERE d.id = :id${transaction ? ' FOR UPDATE' : ''}`,
      { replacements: { id }, type: QueryTypes.SELECT, transaction });
    return row ? toView(row) : null;
  },

  /** Inserts one definition; returns null when the tank already has one of this kind. */
  async insert(sequelize: Sequelize, tankId: number, s: DefinitionSettings, at: Date, transaction?: Transaction): Promise<number | null> {
    const c = { tank_id: tankId, kind: s.kind, ...columns(s), created_at: at, updated_at: at };
    const keys = Object.keys(c);
    // The (tank_id, kind) unique key decides; a duplicate fails only this statement, not the transaction.
    try {
      const [id] = await sequelize.query(`INSERT INTO alarm_definitions (${keys.join(', ')}) VALUES (${keys.map(() => '?').join(', ')})`,
        { replacements: Object.values(c), type: QueryTypes.INSERT, transaction });
      return Number(id);
    } catch (err) {
      if (err instanceof UniqueConstraintError) return null;
      throw err;
    }
  },

  async update(sequelize: Sequelize, id: number, s: DefinitionSettings, at: Date, transaction: Transaction): Promise<void> {
    const c = { ...columns(s), updated_at: at };
    await sequelize.query(`UPDATE alarm_definitions SET ${Object.keys(c).map((k) => `${k} = ?`).join(', ')} WHERE id = ?`,
      { replacements: [...Object.values(c), id], transaction });
  },

  db: (): Sequelize => Site.sequelize!,
};
