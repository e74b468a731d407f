// Two real API processes behind Debian's nginx, on loopback, for the scale-out test: each instance is
// `apps/api/src/main.ts` as production runs it (its own pool, scheduler and mailer), nginx balances them
// round-robin and tells in a response header which instance answered.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { repoRoot } from '../../apps/api/src/config.js';

export const NGINX = '/usr/sbin/nginx';

export interface Child {
  name: string;
  proc: ChildProcess;
  /** Everything the process printed (pino's JSON lines for an API instance). */
  output: () => string;
}

function start(name: string, cmd: string, args: string[], env: NodeJS.ProcessEnv): Child {
  // A process group of its own, so that stopping it stops whatever it started.
  const proc = spawn(cmd, args, { cwd: repoRoot, env, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  let out = '';
  proc.stdout?.on('data', (d: Buffer) => (out += d.toString()));
  proc.stderr?.on('data', (d: Buffer) => (out += d.toString()));
  return { name, proc, output: () => out };
}

export function stopChild(child: Child | undefined): Promise<void> {
  const { proc } = child ?? {};
  if (!proc || proc.exitCode !== null || proc.signalCode !== null || proc.pid === undefined) return Promise.resolve();
  return new Promise((resolve) => {
    const kill = (signal: NodeJS.Signals) => {
      try {
        process.kill(-proc.pid!, signal);
      } catch {
        /* already gone */
      }
    };
    const timer = setTimeout(() => kill('SIGKILL'), 8000);
    proc.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    kill('SIGTERM');
  });
}

/** One API instance: node + tsx on `main.ts`, with the given environment on top of this process's. */
export function startInstance(name: string, env: NodeJS.ProcessEnv): Child {
  return start(name, process.execPath, ['--import', 'tsx', 'apps/api/src/main.ts'], {
    ...process.env,
    ...env,
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
  });
}

export async function waitForHealth(url: string, child: Child, timeoutMs = 90_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (child.proc.exitCode !== null) throw new Error(`${child.name} exited:\n${child.output()}`);
    try {
      if ((await fetch(url)).ok) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} (${child.name}) did not answer within ${timeoutMs / 1000} s:\n${child.output()}`);
}

/**
 * nginx in the foreground with a configuration written into `dir`: listens on 127.0.0.1:`port`, balances
 * `upstreams` round-robin, streams request bodies through (no buffering, 25 MB at most: imports take 20 MB)
 * and names the instance that answered in `X-Upstream`.
 */
export async function startNginx(dir: string, port: number, upstreams: number[]): Promise<Child> {
  if (!existsSync(NGINX))
    throw new Error(`${NGINX} is missing: bash docker-free-scripts/install.sh --browser installs Debian's nginx`);
  await mkdir(path.join(dir, 'temp'), { recursive: true });
  const conf = `
worker_processes 1;
pid ${dir}/nginx.pid;
error_log ${dir}/error.log warn;
events { worker_connections 256; }
http {
  access_log off;
  client_body_temp_path ${dir}/temp/body;
  proxy_temp_path ${dir}/temp/proxy;
  fastcgi_temp_path ${dir}/temp/fastcgi;
  uwsgi_temp_path ${dir}/temp/uwsgi;
  scgi_temp_path ${dir}/temp/scgi;
  upstream beadroll {
${upstreams.map((p) => `    server 127.0.0.1:${p} max_fails=0;`).join('\n')}
    keepalive 8;
  }
  server {
    listen 127.0.0.1:${port};
    client_max_body_size 25m;
    location / {
      proxy_pass http://beadroll;
      proxy_http_version 1.1;
      proxy_set_header Connection "";
      proxy_set_header Host $http_host;
      proxy_set_header X-Forwarded-For $proxy_add_x_forwarded_for;
      proxy_set_header X-Forwarded-Proto $scheme;
      proxy_request_buffering off;
      proxy_next_upstream off;
      add_header X-Upstream $upstream_addr always;
    }
  }
}
`;
  const file = path.join(dir, 'nginx.conf');
  await writeFile(file, conf);
  const child = start('nginx', NGINX, ['-e', path.join(dir, 'error.log'), '-p', dir, '-c', file, '-g', 'daemon off;'], process.env);
  const until = Date.now() + 15_000;
  while (Date.now() < until) {
    if (child.proc.exitCode !== null) throw new Error(`nginx exited:\n${child.output()}`);
    try {
      await fetch(`http://127.0.0.1:${port}/`);
      return child;
    } catch {
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  throw new Error(`nginx did not listen on ${port}:\n${child.output()}`);
}
