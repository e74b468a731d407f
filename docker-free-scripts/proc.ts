// Small helpers the start and test scripts share: run a command to its end, or keep one running.
import { spawn, type ChildProcess } from 'node:child_process';

export interface RunResult {
  code: number;
  ms: number;
}

export function run(cmd: string, args: string[], opts: { env?: NodeJS.ProcessEnv; quiet?: boolean } = {}): Promise<RunResult> {
  const started = Date.now();
  return new Promise((resolve) => {
    const child = spawn(cmd, args, {
      env: { ...process.env, ...opts.env },
      stdio: opts.quiet ? ['ignore', 'pipe', 'pipe'] : ['ignore', 'inherit', 'inherit'],
    });
    let output = '';
    child.stdout?.on('data', (d: Buffer) => (output += d.toString()));
    child.stderr?.on('data', (d: Buffer) => (output += d.toString()));
    child.on('close', (code) => {
      const result = { code: code ?? 1, ms: Date.now() - started };
      if (result.code !== 0 && opts.quiet) process.stdout.write(output);
      resolve(result);
    });
  });
}

export function keep(cmd: string, args: string[], env: NodeJS.ProcessEnv): ChildProcess {
  // A process group of its own, so that stopping it also stops whatever it started.
  return spawn(cmd, args, { env: { ...process.env, ...env }, stdio: ['ignore', 'inherit', 'inherit'], detached: true });
}

export function stop(child: ChildProcess | undefined): Promise<void> {
  if (!child || child.exitCode !== null || child.pid === undefined) return Promise.resolve();
  return new Promise((resolve) => {
    const timer = setTimeout(() => {
      try {
        process.kill(-child.pid!, 'SIGKILL');
      } catch {
        /* already gone */
      }
    }, 5000);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    try {
      process.kill(-child.pid!, 'SIGTERM');
    } catch {
      resolve();
    }
  });
}

export async function waitForHealth(url: string, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

export const tsx = (script: string, ...args: string[]): [string, string[]] => [
  process.execPath,
  ['--import', 'tsx', script, ...args],
];
