import { readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';

const HEADING = /^## bench:(\S+)/;

/**
 * Puts one benchmark's printed lines into bench/results/latest.md as its own "## bench:<name>"
 * section, replacing the one of an earlier run and keeping every other section as it is.
 */
export function writeBenchSection(root: string, name: string, lines: string[]): void {
  const file = path.join(root, 'bench/results/latest.md');
  let text = '';
  try {
    text = readFileSync(file, 'utf8');
  } catch {
    text = '# Benchmark results (latest run)\n';
  }
  const kept: string[] = [];
  let skipping = false;
  for (const line of text.split('\n')) {
    const m = HEADING.exec(line);
    if (m) skipping = m[1] === name || m[1]?.startsWith(`${name} `) === true;
    else if (line.startsWith('## ')) skipping = false;
    if (!skipping) kept.push(line);
  }
  while (kept.length && kept[kept.length - 1] === '') kept.pop();
  const section = ['', `## bench:${name} (run ${new Date().toISOString()})`, '```', ...lines, '```', ''];
  writeFileSync(`${file}.tmp`, [...kept, ...section].join('\n'));
  renameSync(`${file}.tmp`, file);
}

/** The sections of benchmarks that `npm run bench` does not run itself, to carry over when it rewrites the file. */
export function otherSections(root: string, ran: readonly string[]): string[] {
  let text = '';
  try {
    text = readFileSync(path.join(root, 'bench/results/latest.md'), 'utf8');
  } catch {
    return [];
  }
  const out: string[] = [];
  let keeping = false;
  for (const line of text.split('\n')) {
    const m = HEADING.exec(line);
    if (m) keeping = !ran.includes(m[1]!);
    else if (line.startsWith('## ')) keeping = false;
    if (keeping) out.push(line);
  }
  return out;
}
