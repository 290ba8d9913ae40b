import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
const one = async (sql: string) => ((await t.sequelize.query(sql, { type: QueryTypes.SELECT })) as { id: number }[])[0]!.id;
let kestrelId: number;
let otherProbeId: number;
let probeId: number;
beforeAll(async () => {
  t = await createTestApi();
  kestrelId = await one("SELECT id FROM sites WHERE tag = 'kestrel'");
  probeId = await one("SELECT id FROM probes WHERE tag = 'A1-ORP'");
  // A second site with a probe of its own, for the site-rights check.
  await t.sequelize.query("INSERT INTO sites (tag, name, time_zone, created_at, updated_at) VALUES ('osprey', 'Osprey', 'UTC', NOW(), NOW())");
  await t.sequelize.query("INSERT INTO circuits (site_id, tag, name, position, created_at, updated_at) SELECT id, 'O', 'O', 0, NOW(), NOW() FROM sites WHERE tag = 'osprey'");
  await t.sequelize.query(`INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at)
    SELECT c.id, 'O1', 'O1', 0, 10, 1, 2, NOW(), NOW() FROM circuits c JOIN sites s ON s.id = c.site_id WHERE s.tag = 'osprey'`);
  await t.sequelize.query(`INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
    SELECT id, 'O1-ORP', 'agcl-sat', 0.199, -0.001, 10, 5, NOW(), 1, NOW(), NOW() FROM tanks WHERE tag = 'O1'`);
  otherProbeId = await one("SELECT id FROM probes WHERE tag = 'O1-ORP'");
});
afterAll(async () => t?.close());

const post = (path: string, body: object) => request(t.app).post(path).set('Cookie', t.cookies.admin).set('X-Ferrisight-Csrf', '1').send(body);

describe('Plant setup: Sparkplug groups and metric mapping', () => {
  it('when a group and two metrics are added, then the setup lists them with their probe and site', async () => {
    expect((await post('/api/admin/sparkplug/groups', { siteId: kestrelId, groupId: 'kestrel-leach' })).status).toBe(201);
    const base = { groupId: 'kestrel-leach', edgeNodeId: 'gw-1', deviceId: 'a1' };
    expect((await post('/api/admin/sparkplug/mappings', { ...base, metricName: 'ORP', role: 'orp', probeId })).status).toBe(201);
    expect((await post('/api/admin/sparkplug/mappings', { ...base, metricName: 'Temp', role: 'temp', probeId })).status).toBe(201);
    const res = await request(t.app).get('/api/admin/sparkplug').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(200);
    expect(res.body.groups).toEqual([expect.objectContaining({ groupId: 'kestrel-leach', siteTag: 'kestrel' })]);
    expect(res.body.mappings).toEqual([
      expect.objectContaining({ metricName: 'ORP', role: 'orp', probeTag: 'A1-ORP', siteTag: 'kestrel', deviceId: 'a1' }),
      expect.objectContaining({ metricName: 'Temp', role: 'temp', probeTag: 'A1-ORP' }),
    ]);
  });

  it('when a body breaks the schema, then the answer is problem+json with the field errors', async () => {
    const res = await post('/api/admin/sparkplug/mappings', { groupId: 'a/b', edgeNodeId: '', metricName: 'x', role: 'ph', probeId: 1 });
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    const paths = res.body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(['groupId', 'edgeNodeId', 'role']));
  });

  it('when a probe of another site is mapped into a group, then it is refused on probeId', async () => {
    const res = await post('/api/admin/sparkplug/mappings', { groupId: 'kestrel-leach', edgeNodeId: 'gw-1', metricName: 'ORP2', role: 'orp', probeId: otherProbeId });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'probeId', message: 'This probe belongs to another site than the group' }]);
  });

  it('when a metric or a probe\'s role is mapped twice, or a group is taken, then it is a conflict and nothing changes', async () => {
    const again = await post('/api/admin/sparkplug/mappings', { groupId: 'kestrel-leach', edgeNodeId: 'gw-1', deviceId: 'a1', metricName: 'ORP', role: 'orp', probeId });
    expect(again.status).toBe(409);
    const roleTaken = await post('/api/admin/sparkplug/mappings', { groupId: 'kestrel-leach', edgeNodeId: 'gw-9', metricName: 'ORP', role: 'orp', probeId });
    expect(roleTaken.status).toBe(409);
    expect((await post('/api/admin/sparkplug/groups', { siteId: kestrelId, groupId: 'kestrel-leach' })).status).toBe(409);
    const res = await request(t.app).get('/api/admin/sparkplug').set('Cookie', t.cookies.admin);
    expect(res.body.mappings).toHaveLength(2);
  });

  it('when a group is removed, then its mappings go with it', async () => {
    const list = await request(t.app).get('/api/admin/sparkplug').set('Cookie', t.cookies.admin);
    const del = await request(t.app).delete(`/api/admin/sparkplug/groups/${list.body.groups[0].id}`).set('Cookie', t.cookies.admin).set('X-Ferrisight-Csrf', '1');
    expect(del.status).toBe(204);
    const after = await request(t.app).get('/api/admin/sparkplug').set('Cookie', t.cookies.admin);
    expect(after.body).toMatchObject({ groups: [], mappings: [] });
  });
});
