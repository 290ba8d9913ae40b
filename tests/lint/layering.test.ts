import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

// The layering rules of eslint.config.js, each shown failing on a deliberately bad import
// (linted as text, never written to disk) and passing on an allowed one.
const eslint = new ESLint();

async function ruleIds(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result.messages.map((m) => m.ruleId ?? m.message);
}

describe('layering lint rules', () => {
  it('when api/ imports ingest/, then lint fails', async () => {
    const ids = await ruleIds('api/src/modules/readings/bad.ts', "import { startWorker } from '../../../../ingest/start-worker.ts';\nexport const x = startWorker;\n");
    expect(ids).toContain('import-x/no-restricted-paths');
  });

  it('when ingest/ imports api/, then lint passes (ingest → api is the allowed direction)', async () => {
    const ids = await ruleIds('ingest/ok.ts', "import { createIngestPool } from '../api/src/db/pool.ts';\nexport const x = createIngestPool;\n");
    expect(ids).not.toContain('import-x/no-restricted-paths');
  });

  it('when shared/ imports api/ or an unlisted package, then lint fails', async () => {
    const up = await ruleIds('shared/redox/bad.ts', "import { logger } from '../../api/src/lib/logger.ts';\nexport const x = logger;\n");
    expect(up).toContain('import-x/no-restricted-paths');
    const pkg = await ruleIds('shared/redox/bad.ts', "import express from 'express';\nexport const x = express;\n");
    expect(pkg).toContain('no-restricted-imports');
    const zod = await ruleIds('shared/redox/ok.ts', "import { z } from 'zod';\nexport const x = z.number();\n");
    expect(zod).not.toContain('no-restricted-imports');
  });

  it('when web/ imports api/, then lint fails', async () => {
    const ids = await ruleIds('web/src/lib/bad.ts', "import { AppError } from '../../../api/src/lib/app-error.ts';\nexport const x = AppError;\n");
    expect(ids).toContain('import-x/no-restricted-paths');
  });

  it('when one web feature imports another, then lint fails; inside a feature it passes', async () => {
    const cross = await ruleIds('web/src/features/floor/bad.ts', "import * as tanks from '../tanks/api/tank-keys.ts';\nexport const x = tanks;\n");
    expect(cross).toContain('import-x/no-restricted-paths');
    const own = await ruleIds('web/src/features/floor/ok.ts', "import * as floor from './api/plant-keys.ts';\nexport const x = floor;\n");
    expect(own).not.toContain('import-x/no-restricted-paths');
  });

  it('when two modules import each other, then lint reports the cycle', async () => {
    // shared/redox/nernst.ts imports guards.ts: guards importing nernst back closes a cycle.
    const ids = await ruleIds('shared/redox/guards.ts', "import { orpToRatio } from './nernst.ts';\nexport const x = orpToRatio;\n");
    expect(ids).toContain('import-x/no-cycle');
  });
});
