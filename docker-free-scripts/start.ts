// npm start: PostgreSQL, the mail catcher and the object store on loopback, migrations and the demo seed,
// a fresh build of the web app, then the API serving web + API on one address. Ctrl-C stops it all.
import path from 'node:path';
import { startMailCatcher } from './mail-catcher.js';
import { startObjectStore, storeCredentials } from './object-store.js';
import { keep, run, stop, tsx, waitForHealth } from './proc.js';
import { buildWeb } from './web-build.js';

const env = process.env;
const port = env.PORT ?? '8080';
const dataDir = env.DATA_DIR ?? path.resolve('.data');
const url = `http://127.0.0.1:${port}`;
const appEnv = {
  NODE_ENV: env.NODE_ENV ?? 'development',
  APP_URL: env.APP_URL ?? url,
  WEB_DIST: path.resolve('apps/web/dist'),
};

async function must(step: string, p: Promise<{ code: number }>) {
  const { code } = await p;
  if (code !== 0) {
    console.error(`beadroll: ${step} failed (exit ${code})`);
    await shutdown(1);
  }
}

// Filled in as each part starts, so that Ctrl-C at any moment stops what is running.
const running: { api?: ReturnType<typeof keep> } = {};
let services: { close(): Promise<void> }[] = [];
let stopping: Promise<void> | undefined;

// Ctrl-C reaches this process more than once (the terminal's process group and npm's forwarding):
// every call waits for the same orderly stop.
async function shutdown(code: number): Promise<never> {
  stopping ??= (async () => {
    console.log('\nbeadroll: stopping');
    await stop(running.api);
    await Promise.all(services.map((s) => s.close()));
    await run('bash', ['docker-free-scripts/pg.sh', 'stop']);
  })();
  await stopping;
  process.exit(code);
}
process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));

// The web build (only when its sources changed) runs while the database and services come up.
const build = buildWeb();
await must('PostgreSQL', run('bash', ['docker-free-scripts/pg.sh', 'start']));
services = [
  await startMailCatcher({ port: Number(env.SMTP_PORT ?? 2525), dir: path.join(dataDir, 'mail') }),
  await startObjectStore({
    port: Number(env.S3_PORT ?? 4569),
    dir: path.join(dataDir, 's3'),
    bucket: env.S3_BUCKET ?? 'beadroll',
    credentials: storeCredentials(dataDir),
  }),
];
console.log(`beadroll: mail catcher on 127.0.0.1:${env.SMTP_PORT}, object store on 127.0.0.1:${env.S3_PORT}`);
// The seed applies pending migrations first, then adds the demo data when it is missing.
await must('migrations and demo seed', run(...tsx('apps/api/src/db/seed.ts'), { env: appEnv }));
await must('web build', build);
console.log((await build).skipped ? 'beadroll: the web build is up to date' : 'beadroll: web app built');
const api = keep(...tsx('apps/api/src/main.ts'), appEnv);
running.api = api;
api.on('exit', (code) => {
  if (!stopping) {
    console.error(`beadroll: the API stopped (exit ${code})`);
    void shutdown(1);
  }
});
await waitForHealth(`${url}/api/health`);
const readyIn = (performance.now() / 1000).toFixed(1);

console.log(`
Beadroll is running at ${url} (ready in ${readyIn} s; development mode: demo data, mail caught at /dev/mail)
  mail caught in development: ${url}/dev/mail

Demo accounts (password demo-weld-2026):
  qa@beadroll-demo.example        QA manager, every shop
  foreman@beadroll-demo.example   foreman of Vessel Bay and Structural Hall
  welder@beadroll-demo.example    welder PV-07
  other@beadroll-demo.example     QA manager of Dunmore Kettle Works (a second company)

Computed ranges and statuses support, and do not replace, the code edition in force, the company's
quality manual and the responsible inspector.
Press Ctrl-C to stop.`);
