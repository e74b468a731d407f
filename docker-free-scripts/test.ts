// npm test: every suite against real services on the test run's own ports, with one summary line per
// suite and a closing count. Exits non-zero when any suite fails.
// Usage: npm test [-- --only typecheck,lint,unit,integration,e2e] [--files tests/e2e/x.spec.ts,tests/integration/y]
import { existsSync, readFileSync } from 'node:fs';
import { rm, mkdir } from 'node:fs/promises';
import path from 'node:path';
import { startMailCatcher } from './mail-catcher.js';
import { startObjectStore, storeCredentials } from './object-store.js';
import { keep, run, stop, tsx, waitForHealth, type RunResult } from './proc.js';
import { buildWeb } from './web-build.js';

const env = process.env;
const dataDir = path.resolve(env.DATA_DIR ?? '.data-test');
const port = env.PORT ?? '18080';
const baseUrl = `http://127.0.0.1:${port}`;
const onlyArg = process.argv.indexOf('--only');
const only = onlyArg > 0 ? new Set((process.argv[onlyArg + 1] ?? '').split(',')) : null;
const wanted = (name: string) => !only || only.has(name);
// `--files a,b` narrows the integration and browser suites to those test files (for working on one part).
const filesArg = process.argv.indexOf('--files');
const files = filesArg > 0 ? (process.argv[filesArg + 1] ?? '').split(',').filter(Boolean) : [];

interface SuiteLine {
  name: string;
  ok: boolean;
  passed?: number;
  failed?: number;
  skipped?: number;
  ms: number;
}
const lines: SuiteLine[] = [];
const started = Date.now();

function vitestCounts(file: string) {
  if (!existsSync(file)) return {};
  const report = JSON.parse(readFileSync(file, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
    numTodoTests: number;
  };
  return { passed: report.numPassedTests, failed: report.numFailedTests, skipped: report.numPendingTests + report.numTodoTests };
}

async function suite(name: string, cmd: string, args: string[], extraEnv: NodeJS.ProcessEnv = {}) {
  console.log(`\n━━ ${name} ━━`);
  const res = await run(cmd, args, { env: extraEnv });
  lines.push({ name, ok: res.code === 0, ms: res.ms });
  return res;
}

async function vitestSuite(name: string, args: string[], extraEnv: NodeJS.ProcessEnv = {}) {
  const out = path.join(dataDir, `${name.replace(/\W+/g, '-')}.json`);
  console.log(`\n━━ ${name} ━━`);
  const res: RunResult = await run(
    process.execPath,
    ['node_modules/vitest/vitest.mjs', 'run', ...args, '--reporter=default', '--reporter=json', `--outputFile.json=${out}`],
    { env: extraEnv },
  );
  const counts = vitestCounts(out);
  // A suite that ran no test has not shown anything: count it as a failure.
  const ok = res.code === 0 && (counts.passed ?? 0) > 0;
  lines.push({ name, ok, ms: res.ms, ...counts });
}

let services: { close(): Promise<void> }[] = [];
let api: ReturnType<typeof keep> | undefined;

async function finish(): Promise<never> {
  await stop(api);
  await Promise.all(services.map((s) => s.close()));
  await run('bash', ['docker-free-scripts/pg.sh', 'stop'], { quiet: true });
  console.log('\n━━ summary ━━');
  let passed = 0;
  let failed = 0;
  for (const l of lines) {
    const counts = l.passed === undefined ? '' : ` ${l.passed} passed, ${l.failed} failed${l.skipped ? `, ${l.skipped} skipped` : ''}`;
    console.log(`${l.ok ? 'PASS' : 'FAIL'} ${l.name.padEnd(12)}${counts} (${(l.ms / 1000).toFixed(1)} s)`);
    passed += l.passed ?? 0;
    failed += l.failed ?? (l.ok ? 0 : 1);
  }
  console.log(`total time ${((Date.now() - started) / 1000).toFixed(0)} s`);
  console.log(`${passed} passed, ${failed} failed`);
  process.exit(lines.every((l) => l.ok) && lines.length > 0 ? 0 : 1);
}
let interrupted = false;
process.on('SIGINT', () => {
  if (interrupted) return; // npm forwards the terminal's Ctrl-C too
  interrupted = true;
  lines.push({ name: 'interrupted', ok: false, ms: 0 });
  void finish();
});

// A fresh data folder each run: a new PostgreSQL cluster (about 1.5 s), an empty mail box and bucket.
await run('bash', ['docker-free-scripts/pg.sh', 'stop'], { quiet: true });
await rm(dataDir, { recursive: true, force: true });
await mkdir(dataDir, { recursive: true });

if (wanted('typecheck')) await suite('typecheck', 'npm', ['run', '--silent', 'typecheck']);
if (wanted('lint')) await suite('lint', 'npm', ['run', '--silent', 'lint']);
if (wanted('unit')) {
  await vitestSuite('unit:rules', ['--root', 'packages/rules']);
  await vitestSuite('unit:api', ['--root', 'apps/api']);
  await vitestSuite('unit:web', ['--root', 'apps/web']);
}

if (wanted('integration') || wanted('e2e')) {
  const pg = await run('bash', ['docker-free-scripts/pg.sh', 'start', '--fast']);
  if (pg.code !== 0) {
    lines.push({ name: 'services', ok: false, ms: pg.ms });
    await finish();
  }
  services = [
    await startMailCatcher({ port: Number(env.SMTP_PORT), dir: path.join(dataDir, 'mail') }),
    await startObjectStore({
      port: Number(env.S3_PORT),
      dir: path.join(dataDir, 's3'),
      bucket: 'beadroll',
      credentials: storeCredentials(dataDir),
    }),
  ];
}

if (wanted('integration')) {
  await vitestSuite('integration', ['--config', 'tests/vitest.integration.config.ts', ...files.filter((f) => f.includes('integration'))], { NODE_ENV: 'test' });
}

if (wanted('e2e')) {
  const e2eEnv = {
    NODE_ENV: 'test',
    PGDATABASE: 'beadroll_e2e',
    APP_URL: baseUrl,
    WEB_DIST: path.resolve('apps/web/dist'),
    E2E_BASE_URL: baseUrl,
    // The invitee journey reads its invitation from the development inbox while signed out.
    DEV_MAIL_OPEN: 'true',
  };
  const prep = [
    await run('bash', ['docker-free-scripts/pg.sh', 'reset-db', 'beadroll_e2e'], { quiet: true }),
    await buildWeb(),
    await run(...tsx('apps/api/src/db/migrate.ts'), { env: e2eEnv, quiet: true }),
    await run(...tsx('apps/api/src/db/seed.ts'), { env: e2eEnv, quiet: true }),
  ];
  if (prep.some((p) => p.code !== 0)) {
    lines.push({ name: 'e2e', ok: false, ms: prep.reduce((a, p) => a + p.ms, 0) });
  } else {
    api = keep(...tsx('apps/api/src/main.ts'), e2eEnv);
    try {
      await waitForHealth(`${baseUrl}/api/health`);
      await vitestSuite('e2e', ['--config', 'tests/vitest.e2e.config.ts', ...files.filter((f) => f.includes('e2e'))], e2eEnv);
    } catch (err) {
      console.error(err);
      lines.push({ name: 'e2e', ok: false, ms: 0 });
    }
  }
}

await finish();
