import type { ActiveFault, SimCommand, SimFault } from '../../shared/schemas/simulator.ts';
import type { Random } from './tank-model.ts';

type Active = { fault: SimFault; sinceMs: number };

/** Which faults run on which probe, and how each one bends a probe reading. */
export class FaultBoard {
  private readonly active = new Map<string, Active[]>();
  private readonly frozenMv = new Map<string, number>();

  /** Applies a command; returns false when it changed nothing. */
  apply(cmd: SimCommand, nowMs: number): boolean {
    const list = this.active.get(cmd.probeTag) ?? [];
    if (cmd.fault === 'clear') {
      this.active.delete(cmd.probeTag);
      this.frozenMv.delete(cmd.probeTag);
      return list.length > 0;
    }
    const has = list.some((a) => a.fault === cmd.fault);
    if (cmd.action === 'clear') {
      if (!has) return false;
      this.active.set(cmd.probeTag, list.filter((a) => a.fault !== cmd.fault));
      if (cmd.fault === 'flatline') this.frozenMv.delete(cmd.probeTag);
      return true;
    }
    if (has) return false;
    this.active.set(cmd.probeTag, [...list, { fault: cmd.fault, sinceMs: nowMs }]);
    return true;
  }

  has(probeTag: string, fault: SimFault): boolean {
    return (this.active.get(probeTag) ?? []).some((a) => a.fault === fault);
  }

  /** For the retained state topic (the API's admin control shows it). */
  list(): ActiveFault[] {
    return [...this.active].flatMap(([probeTag, list]) => list.map((a) => ({ fault: a.fault, probeTag, since: new Date(a.sinceMs).toISOString() })));
  }

  /**
   * The mV the probe reports for a true reading: ±1.5 mV noise normally, ±20 mV when noisy,
   * a coating that drags the reading down ~1 mV/min (to −60 mV) when fouled, and a value
   * stuck at its last reading when flat-lined.
   */
  probeMv(probeTag: string, trueMv: number, nowMs: number, random: Random): number {
    const list = this.active.get(probeTag) ?? [];
    const since = (f: SimFault) => list.find((a) => a.fault === f)?.sinceMs;
    const frozen = this.frozenMv.get(probeTag);
    if (since('flatline') !== undefined && frozen !== undefined) return frozen;
    let mv = trueMv + (random() - 0.5) * 3;
    if (since('noisy') !== undefined) mv += (random() - 0.5) * 40;
    const fouledAt = since('fouling');
    if (fouledAt !== undefined) mv -= Math.min(60, (nowMs - fouledAt) / 60_000);
    mv = Math.round(mv * 10) / 10;
    this.frozenMv.set(probeTag, mv);
    return mv;
  }
}
