/**
 * Alarm lifecycle after ISA-18.2 / IEC 62682 (states named as in those standards).
 * Pure and browser-safe: the API, the engine and the Alarm desk share this one table, so a
 * transition the server refuses is one the screen never offers.
 *
 * An alarm's state is the pair (state, conditionActive): the standard states say whether the
 * process condition is abnormal for the annunciated ones; shelved, out of service and
 * suppressed keep tracking the condition so that leaving them re-annunciates correctly.
 */
export const ALARM_STATES = [
  'normal', 'unacknowledged', 'acknowledged', 'rtn-unacknowledged', 'shelved', 'out-of-service', 'suppressed',
] as const;
export type AlarmState = (typeof ALARM_STATES)[number];

export const ALARM_ACTIONS = [
  'activate', 'clear', 'acknowledge', 'shelve', 'unshelve', 'remove-from-service', 'return-to-service',
  'suppress', 'unsuppress', 'comment',
] as const;
export type AlarmAction = (typeof ALARM_ACTIONS)[number];

/** How a transition came about, recorded with every event. */
export const ALARM_HOW = ['screen', 'email', 'automatic'] as const;
export type AlarmHow = (typeof ALARM_HOW)[number];

export type AlarmStatus = { state: AlarmState; conditionActive: boolean };
export type TransitionResult = { ok: true; to: AlarmStatus } | { ok: false; reason: string };

/** States that need an operator's attention and are annunciated. */
export const ANNUNCIATED: readonly AlarmState[] = ['unacknowledged', 'acknowledged', 'rtn-unacknowledged'];
export const UNACKNOWLEDGED: readonly AlarmState[] = ['unacknowledged', 'rtn-unacknowledged'];
/** States in which the condition is tracked silently. */
const HIDDEN: readonly AlarmState[] = ['shelved', 'out-of-service', 'suppressed'];

/** Where an alarm goes when a hiding state ends: re-annunciated when still abnormal. */
const reveal = (active: boolean): AlarmStatus => ({ state: active ? 'unacknowledged' : 'normal', conditionActive: active });

const refuse = (reason: string): TransitionResult => ({ ok: false, reason });
const to = (state: AlarmState, conditionActive: boolean): TransitionResult => ({ ok: true, to: { state, conditionActive } });

/**
 * The transition function. Refuses (never throws) what the current state does not allow, with
 * a reason fit to show to a user. 'comment' is allowed everywhere and changes nothing.
 */
export function transition(from: AlarmStatus, action: AlarmAction): TransitionResult {
  const { state, conditionActive: active } = from;
  switch (action) {
    case 'comment':
      return to(state, active);
    case 'activate':
      if (active) return refuse('The condition is already active');
      if (state === 'normal' || state === 'rtn-unacknowledged') return to('unacknowledged', true);
      return HIDDEN.includes(state) ? to(state, true) : refuse(`Cannot activate from ${state}`);
    case 'clear':
      if (!active) return refuse('The condition is already normal');
      if (state === 'unacknowledged') return to('rtn-unacknowledged', false);
      if (state === 'acknowledged') return to('normal', false);
      return HIDDEN.includes(state) ? to(state, false) : refuse(`Cannot clear from ${state}`);
    case 'acknowledge':
      if (state === 'unacknowledged') return to('acknowledged', true);
      if (state === 'rtn-unacknowledged') return to('normal', false);
      return refuse(state === 'acknowledged' ? 'Already acknowledged' : `Nothing to acknowledge while ${state}`);
    case 'shelve':
      if (state === 'shelved') return refuse('Already shelved');
      if (state === 'out-of-service' || state === 'suppressed') return refuse(`Cannot shelve while ${state}`);
      return to('shelved', active);
    case 'unshelve':
      return state === 'shelved' ? { ok: true, to: reveal(active) } : refuse('Not shelved');
    case 'remove-from-service':
      return state === 'out-of-service' ? refuse('Already out of service') : to('out-of-service', active);
    case 'return-to-service':
      return state === 'out-of-service' ? { ok: true, to: reveal(active) } : refuse('Not out of service');
    case 'suppress':
      // Out of service is a deliberate act by a person and outranks suppression by design.
      if (state === 'suppressed' || state === 'out-of-service') return refuse(`Cannot suppress while ${state}`);
      return to('suppressed', active);
    case 'unsuppress':
      return state === 'suppressed' ? { ok: true, to: reveal(active) } : refuse('Not suppressed');
  }
}

/** True when the action is allowed from this status (for offering buttons). */
export const canApply = (from: AlarmStatus, action: AlarmAction): boolean => transition(from, action).ok;

/** The event kind recorded for an action (past tense, as shown in the timeline). */
export const EVENT_KIND: Record<AlarmAction, string> = {
  activate: 'activated',
  clear: 'cleared',
  acknowledge: 'acknowledged',
  shelve: 'shelved',
  unshelve: 'unshelved',
  'remove-from-service': 'removed-from-service',
  'return-to-service': 'returned-to-service',
  suppress: 'suppressed',
  unsuppress: 'unsuppressed',
  comment: 'commented',
};

/** Longest shelve allowed: 12 h, so a shelved alarm is looked at again within a day's two shifts. */
export const MAX_SHELVE_MIN = 12 * 60;
