// Builds the web app for production only when its sources changed since the last build: a fingerprint
// of every file the build reads (the web app, the rules package, the lock file) is kept beside the
// build, so a second `npm start` serves the existing build at once.
import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { readdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { run, type RunResult } from './proc.js';

const sources = ['apps/web/src', 'apps/web/public', 'apps/web/index.html', 'apps/web/vite.config.ts', 'apps/web/package.json', 'packages/rules/src', 'packages/rules/package.json', 'package-lock.json'];
const dist = 'apps/web/dist';
const stampFile = path.join(dist, '.build-fingerprint');

async function files(entry: string): Promise<string[]> {
  if (!existsSync(entry)) return [];
  const dirents = await readdir(entry, { withFileTypes: true, recursive: true }).catch(() => null);
  if (!dirents) return [entry];
  return dirents.filter((d) => d.isFile()).map((d) => path.join(d.parentPath, d.name));
}

export async function webFingerprint(): Promise<string> {
  const hash = createHash('sha256');
  const all = (await Promise.all(sources.map(files))).flat().sort();
  for (const file of all) {
    if (file.endsWith('.test.ts') || file.endsWith('.test.tsx')) continue;
    hash.update(file).update('\0').update(await readFile(file)).update('\0');
  }
  return hash.digest('hex');
}

/** Builds apps/web/dist unless it was built from exactly these sources. Always a production build. */
export async function buildWeb(opts: { quiet?: boolean } = {}): Promise<RunResult & { skipped: boolean }> {
  const started = Date.now();
  const fingerprint = await webFingerprint();
  const previous = existsSync(stampFile) ? (await readFile(stampFile, 'utf8')).trim() : '';
  if (previous === fingerprint && existsSync(path.join(dist, 'index.html')))
    return { code: 0, ms: Date.now() - started, skipped: true };
  // NODE_ENV decides React's build: a development build is three times larger and renders twice.
  const result = await run(process.execPath, ['node_modules/vite/bin/vite.js', 'build', 'apps/web', '--logLevel', 'warn'], {
    env: { NODE_ENV: 'production' },
    quiet: opts.quiet,
  });
  if (result.code === 0) await writeFile(stampFile, `${fingerprint}\n`);
  return { ...result, ms: Date.now() - started, skipped: false };
}
