import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Repositories are the one way into the database: outside `*.repository.ts` (and migrations),
// no product file in api/ or ingest/ sends SQL, and readings are inserted by one statement.
const root = path.resolve(import.meta.dirname, '../..');

function productFiles(dir: string): string[] {
  return readdirSync(path.join(root, dir), { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && e.name.endsWith('.ts'))
    .map((e) => path.relative(root, path.join(e.parentPath, e.name)));
}

/** Calls that send SQL: query/execute/batch/queryStream on a Sequelize instance, pool or connection. */
const SQL_CALL = /\.(query|execute|batch|queryStream)\s*(<[^>]*>)?\s*\(/g;

function sqlCallsOutsideRepositories(files: { file: string; text: string }[]): string[] {
  return files
    .filter(({ file }) => !file.endsWith('.repository.ts'))
    .flatMap(({ file, text }) => text.split('\n').flatMap((line, i) => (line.match(SQL_CALL) ? [`${file}:${i + 1}`] : [])));
}

const product = ['api', 'ingest'].flatMap(productFiles).map((file) => ({ file, text: readFileSync(path.join(root, file), 'utf8') }));

describe('where SQL lives', () => {
  it('when api/ and ingest/ are scanned, then no file but a repository sends SQL', () => {
    expect(product.length).toBeGreaterThan(50);
    expect(sqlCallsOutsideRepositories(product)).toEqual([]);
  });

  it('when a service sends SQL itself, then the scan names the line', () => {
    const bad = { file: 'api/src/modules/x/x.service.ts', text: "const a = 1;\nawait sequelize.query<{ n: number }>('SELECT 1');\nawait conn.execute('SELECT 1');\n" };
    const ok = { file: 'api/src/modules/x/x.repository.ts', text: "await sequelize.query('SELECT 1');\n" };
    expect(sqlCallsOutsideRepositories([bad, ok])).toEqual(['api/src/modules/x/x.service.ts:2', 'api/src/modules/x/x.service.ts:3']);
  });

  it('when the product code is scanned, then INSERT INTO readings is written once, in the readings repository', () => {
    const found = product.filter(({ text }) => /INSERT INTO readings\b/.test(text)).map(({ file, text }) => [file, text.match(/INSERT INTO readings\b/g)!.length]);
    expect(found).toEqual([['api/src/modules/readings/readings.repository.ts', 1]]);
  });
});
