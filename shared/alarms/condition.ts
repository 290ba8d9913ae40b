/**
 * Condition evaluation with deadband, on-delay and off-delay (the terms of
 * OPC UA Part 9, Alarms and Conditions). Pure: the caller passes the time, so tests drive it with any clock.
 *
 * - The alarm activates once the value has stayed beyond the limit for onDelayS.
 * - It clears once the value has stayed back past the deadband for offDelayS.
 * - Between the limit and the deadband edge nothing changes: that is what stops chattering
 *   from opening new alarms.
 */
export type ConditionMemory = {
  active: boolean;
  /** Since when the value has been beyond the limit while not yet active (on-delay running). */
  pendingSinceMs: number | null;
  /** Since when the value has been back past the deadband while active (off-delay running). */
  clearingSinceMs: number | null;
};

export type ConditionSettings = {
  direction: 'high' | 'low';
  limit: number;
  /** In the limit's unit, or a percentage of the limit when relative. */
  deadband: number;
  relativeDeadband?: boolean;
  onDelayS: number;
  offDelayS: number;
};

export type ConditionStep = { memory: ConditionMemory; change: 'activate' | 'clear' | null };

export const idleMemory = (active = false): ConditionMemory => ({ active, pendingSinceMs: null, clearingSinceMs: null });

/** The value at which an active alarm may clear. */
export function clearEdge(s: ConditionSettings): number {
  const width = s.relativeDeadband ? Math.abs(s.limit) * (s.deadband / 100) : s.deadband;
  return s.direction === 'high' ? s.limit - width : s.limit + width;
}

/** True when the value is beyond the limit (strictly: a value on the limit is still normal). */
export function isBeyond(s: ConditionSettings, value: number): boolean {
  return s.direction === 'high' ? value > s.limit : value < s.limit;
}

/**
 * One evaluation. A null value (not enough data) changes nothing and keeps the timers, so a
 * missing sample neither raises nor clears an alarm.
 */
export function stepCondition(memory: ConditionMemory, s: ConditionSettings, value: number | null, nowMs: number): ConditionStep {
  if (value === null || !Number.isFinite(value)) return { memory, change: null };
  if (!memory.active) {
    if (!isBeyond(s, value)) return { memory: idleMemory(false), change: null };
    const since = memory.pendingSinceMs ?? nowMs;
    if (nowMs - since >= s.onDelayS * 1000) return { memory: idleMemory(true), change: 'activate' };
    return { memory: { active: false, pendingSinceMs: since, clearingSinceMs: null }, change: null };
  }
  const edge = clearEdge(s);
  const back = s.direction === 'high' ? value < edge : value > edge;
  // With no deadband, "back" means simply not beyond the limit.
  const cleared = s.deadband > 0 ? back : !isBeyond(s, value);
  if (!cleared) return { memory: idleMemory(true), change: null };
  const since = memory.clearingSinceMs ?? nowMs;
  if (nowMs - since >= s.offDelayS * 1000) return { memory: idleMemory(false), change: 'clear' };
  return { memory: { active: true, pendingSinceMs: null, clearingSinceMs: since }, change: null };
}
