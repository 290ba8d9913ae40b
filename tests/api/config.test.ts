import { afterEach, describe, expect, it, vi } from 'vitest';
import { ingestConfig, loggingConfig } from '../../api/src/config.ts';

describe('configuration', () => {
  afterEach(() => vi.unstubAllEnvs());

  it('when only logging settings are given, then a process without a database still gets its logging config', () => {
    vi.stubEnv('DATABASE_URL', undefined);
    vi.stubEnv('LOG_LEVEL', 'warn');
    vi.stubEnv('FERRISIGHT_PROC', 'sim');
    expect(loggingConfig()).toMatchObject({ LOG_LEVEL: 'warn', FERRISIGHT_PROC: 'sim' });
  });

  it('when LOG_LEVEL is not a pino level, then the error names the key', () => {
    vi.stubEnv('LOG_LEVEL', 'loud');
    expect(() => loggingConfig()).toThrow(/LOG_LEVEL/);
  });

  it('when FERRISIGHT_DATA_DIR is set, then the broker and API read their data folder from it', () => {
    vi.stubEnv('DATABASE_URL', 'mariadb://u:p@127.0.0.1:1/db');
    vi.stubEnv('FERRISIGHT_DATA_DIR', '/srv/ferrisight-data');
    expect(ingestConfig().FERRISIGHT_DATA_DIR).toBe('/srv/ferrisight-data');
    vi.stubEnv('FERRISIGHT_DATA_DIR', undefined);
    expect(ingestConfig().FERRISIGHT_DATA_DIR).toBe('.data');
  });
});
