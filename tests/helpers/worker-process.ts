import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';

/**
 * `npm run worker` as a child process (tsx workers/start.ts), with the test's environment plus
 * `env`. Stopped by its own PID: SIGTERM lets it close its worker, SIGKILL if it does not.
 */
export function spawnWorker(env: Record<string, string> = {}) {
  const root = process.cwd();
  const child: ChildProcess = spawn(path.join(root, 'node_modules/.bin/tsx'), ['workers/start.ts'], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  let stderr = '';
  child.stderr?.on('data', (chunk: Buffer) => {
    stderr = (stderr + chunk.toString()).slice(-4000);
  });
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return {
    pid: child.pid,
    exited,
    stderr: () => stderr,
    async stop(timeoutMs = 10_000) {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
      await exited;
      clearTimeout(timer);
    },
  };
}
