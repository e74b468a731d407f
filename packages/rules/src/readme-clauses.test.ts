// packages/rules/README.md lists every rule with its clause and source kind: every clause cited anywhere in
// the rules' source must appear there, so a rule added without its line in the README fails here.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = new URL('..', import.meta.url).pathname;

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === 'perf' || name === 'test-support' ? [] : sources(path);
    return /\.ts$/.test(name) && !/\.(test|bench)\.ts$/.test(name) ? [path] : [];
  });
}

// The ways a clause is written in the source: ASME IX paragraphs (QW-322.1(a)), CFR paragraphs
// (CFR 192.229(d)(2)(i)), ISO standards, AWS D1.1 tables and clauses, the pipe standards.
const CLAUSE_PATTERNS = [
  /QW-\d{3}(?:\.\d+)?(?:\([a-z]\))?/g,
  /CFR \d{3}\.\d{3}(?:\([a-z]\))?(?:\(\d\))?(?:\([ivx]+\))?/g,
  /ISO \d{3,5}(?:-\d)?/g,
  /Table \d+\.\d+/g,
  /D1\.1(?:-\d{4})? \d+\.\d+(?:\.\d+)+/g,
  /B36\.\d+M/g,
];

describe('README lists every clause the rules cite', () => {
  const readme = readFileSync(join(root, 'README.md'), 'utf8');
  const cited = new Set<string>();
  for (const file of sources(join(root, 'src'))) {
    const text = readFileSync(file, 'utf8');
    for (const p of CLAUSE_PATTERNS) for (const m of text.matchAll(p)) cited.add(m[0]);
  }

  it('finds the clauses (the scan works)', () => {
    for (const c of ['QW-322.1(a)', 'CFR 192.229(c)(1)', 'ISO 9606-1', 'Table 4.11', 'B36.19M'])
      expect(cited).toContain(c);
  });

  it('every clause cited in src/ appears in packages/rules/README.md', () => {
    expect([...cited].filter((c) => !readme.includes(c)).sort()).toEqual([]);
  });
});
