// `npm run bench:start`: how long `npm start` takes on an already-built tree (target: under 10 s from the
// command to the app answering). Runs `npm start` once to prepare (install check, database, demo data,
// web build when the sources changed) and stops it, then times a second start from the command to the
// moment both /api/health and the web page answer. Uses its own data folder and ports (BENCH_START_PORT,
// default PORT + 6; PGPORT, SMTP_PORT and S3_PORT + 6 likewise) so it runs beside a developer's `npm start`.
// Prints the time and the machine's load; exits 1 when the target is missed. Not a test: the machine
// is shared, so read the figure with the load.
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { cpus, loadavg } from 'node:os';
import path from 'node:path';

const TARGET_S = 10;
const env = process.env;
const offset = (name: string, fallback: number) => String(Number(env[name] ?? fallback) + 6);
const port = env.BENCH_START_PORT ?? offset('PORT', 8080);
const startEnv = {
  ...env,
  PORT: port,
  PGPORT: offset('PGPORT', 55432),
  SMTP_PORT: offset('SMTP_PORT', 2525),
  S3_PORT: offset('S3_PORT', 4569),
  DATA_DIR: path.resolve(env.BENCH_START_DATA_DIR ?? '.data-bench-start'),
  PGDATABASE: 'beadroll',
  LAPSE_WATCH_ENABLED: 'false',
};
const url = `http://127.0.0.1:${port}`;
const load = () => `load ${loadavg().map((l) => l.toFixed(2)).join(' ')} on ${cpus().length} cores`;

async function answers(target: string): Promise<boolean> {
  try {
    return (await fetch(target)).ok;
  } catch {
    return false;
  }
}

/** Starts `npm start`; resolves with the seconds until the API and the web page answer. */
async function start(limitS: number): Promise<{ child: ChildProcess; seconds: number }> {
  const began = performance.now();
  const child = spawn('bash', ['docker-free-scripts/start.sh'], { env: startEnv, stdio: ['ignore', 'ignore', 'inherit'], detached: true });
  while ((performance.now() - began) / 1000 < limitS) {
    if ((await answers(`${url}/api/health`)) && (await answers(`${url}/sign-in`)))
      return { child, seconds: (performance.now() - began) / 1000 };
    if (child.exitCode !== null) throw new Error(`npm start exited (${child.exitCode})`);
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop(child);
  throw new Error(`npm start did not answer within ${limitS} s`);
}

async function stop(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || !child.pid) return;
  const exited = once(child, 'exit');
  process.kill(-child.pid, 'SIGINT'); // Ctrl-C: start.ts stops the API, the services and PostgreSQL
  await exited;
}

console.log(`bench:start: ${load()} before the run; preparing (first start, not timed)…`);
const first = await start(900);
await stop(first.child);
const timed = await start(120);
await stop(timed.child);
const ok = timed.seconds < TARGET_S;
console.log(
  `npm start on a built tree: ${timed.seconds.toFixed(1)} s to the app answering (target < ${TARGET_S} s) ${ok ? 'OK' : 'MISS'}; ` +
    `first start ${first.seconds.toFixed(1)} s; ${load()}`,
);
process.exit(ok ? 0 : 1);
