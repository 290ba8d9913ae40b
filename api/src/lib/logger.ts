import pino from 'pino';
import { loggingConfig } from '../config.ts';

/**
 * A structured logger for one process; `proc` names it unless the start script set
 * FERRISIGHT_PROC. Tests stay quiet unless they ask for a level.
 */
export function createLogger(proc: string): pino.Logger {
  const cfg = loggingConfig();
  return pino({ level: cfg.LOG_LEVEL ?? (cfg.NODE_ENV === 'test' ? 'silent' : 'info'), base: { proc: cfg.FERRISIGHT_PROC ?? proc } });
}

export const logger = createLogger('api');
