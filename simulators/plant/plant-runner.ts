import mqtt, { type MqttClient } from 'mqtt';
import type { Logger } from 'pino';
import { ratioToOrpMv } from '../../shared/redox/index.ts';
import { readingTopic } from '../../shared/schemas/readings.ts';
import { FaultBoard } from './faults.ts';
import { SIM_COMMAND_TOPIC, SIM_STATE_TOPIC, parseInternal } from '../../shared/schemas/internal-topics.ts';
import { simCommandSchema, type SimCommand, type SimState } from '../../shared/schemas/simulator.ts';
import type { SimProbe } from './plant-db.ts';
import { initialState, ratioOf, stepTank, type TankState } from './tank-model.ts';

export type PlantOptions = {
  mqttUrl: string;
  siteTag: string;
  probes: SimProbe[];
  device: { username: string; password: string };
  /** Service account for fault commands; without it the plant runs without remote control. */
  service?: { username: string; password: string };
  log: Logger;
  tickMs?: number;
};

type Live = { probe: SimProbe; state: TankState; lastStepMs: number; nextDueMs: number; seq: number };

/**
 * Plays the plant through the device contract: one QoS 1 `reading` per probe per interval,
 * seq numbered from the clock (so a restart never reuses one), faults applied per probe.
 */
export function runPlant(o: PlantOptions): { stop: () => Promise<void>; board: FaultBoard } {
  const board = new FaultBoard();
  const now = Date.now();
  const live: Live[] = o.probes.map((probe) => ({
    probe, state: initialState(probe.params), lastStepMs: now,
    nextDueMs: now + Math.random() * probe.intervalS * 1000,
    seq: Math.floor(now / (probe.intervalS * 1000)),
  }));
  const device = mqtt.connect(o.mqttUrl, {
    username: o.device.username, password: o.device.password, clientId: `${o.device.username}-plant`,
    protocolVersion: 4, clean: true, reconnectPeriod: 2_000, reconnectOnConnackError: true,
  });
  device.on('connect', () => o.log.info({ probes: live.length }, 'simulator device connected'));
  device.on('error', (err) => o.log.warn({ err: err.message }, 'device connection error'));

  let control: MqttClient | null = null;
  const publishState = () => {
    const state: SimState = { faults: board.list(), at: new Date().toISOString() };
    control?.publish(SIM_STATE_TOPIC, JSON.stringify(state), { qos: 1, retain: true });
  };
  if (o.service) {
    control = mqtt.connect(o.mqttUrl, {
      username: o.service.username, password: o.service.password, clientId: `ferrisight-sim-${process.pid}`,
      protocolVersion: 4, clean: true, reconnectPeriod: 2_000, reconnectOnConnackError: true,
    });
    control.on('connect', () => {
      control!.subscribe(SIM_COMMAND_TOPIC, { qos: 1 });
      publishState();
    });
    control.on('error', (err) => o.log.warn({ err: err.message }, 'control connection error'));
    control.on('message', (topic, payload) => {
      let cmd: SimCommand;
      try {
        cmd = parseInternal(simCommandSchema, topic, payload);
      } catch (err) {
        o.log.warn({ err: (err as Error).message }, 'ignored bad sim command');
        return;
      }
      if (!o.probes.some((p) => p.probeTag === cmd.probeTag)) return void o.log.warn({ cmd }, 'sim command for an unknown probe');
      if (board.apply(cmd, Date.now())) publishState();
      o.log.info({ cmd, active: board.list().length }, 'sim command applied');
    });
  }

  const tick = () => {
    const t = Date.now();
    for (const l of live) {
      if (t < l.nextDueMs) continue;
      const tag = l.probe.probeTag;
      l.state = stepTank(l.state, l.probe.params, { oxidantOn: !board.has(tag, 'pump-trip'), feedUpset: board.has(tag, 'feed-upset') }, (t - l.lastStepMs) / 1000, Math.random);
      l.lastStepMs = t;
      l.nextDueMs += l.probe.intervalS * 1000;
      if (l.nextDueMs < t) l.nextDueMs = t + l.probe.intervalS * 1000; // after a stall, do not burst
      l.seq += 1;
      if (board.has(tag, 'comms-loss')) continue;
      const trueMv = ratioToOrpMv({
        ratio: ratioOf(l.state.ferricFraction), tempC: l.state.tempC, reference: l.probe.reference,
        formalPotentialV: l.probe.formalPotentialV, formalCoeffVPerK: l.probe.formalCoeffVPerK,
      });
      const body = { ts: new Date(t).toISOString(), orpMv: board.probeMv(tag, trueMv, t, Math.random), tempC: Math.round(l.state.tempC * 100) / 100, seq: l.seq };
      device.publish(readingTopic(o.siteTag, tag), JSON.stringify(body), { qos: 1 });
    }
  };
  const timer = setInterval(tick, o.tickMs ?? 250);

  return {
    board,
    async stop() {
      clearInterval(timer);
      await Promise.all([device.endAsync(), control?.endAsync()]);
    },
  };
}
