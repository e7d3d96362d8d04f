import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';

/**
 * `npm run worker` as a child process (tsx workers/start.ts), with the test's environment plus
 * `env`. tsx runs the worker in a node process of its own, so the child leads a process group and
 * every signal goes to the whole group: a SIGKILL that reached only tsx would leave the real worker
 * running, taking later tests' jobs. SIGTERM lets it close its worker, SIGKILL if it does not.
 */
export function spawnWorker(env: Record<string, string> = {}) {
  const root = process.cwd();
  const child: ChildProcess = spawn(path.join(root, 'node_modules/.bin/tsx'), ['workers/start.ts'], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'ignore', 'pipe'],
    detached: true,
  });
  const signal = (name: NodeJS.Signals) => {
    try {
      process.kill(-child.pid!, name);
    } catch {
      // the group has already ended
    }
  };
  let stderr = '';
  child.stderr?.on('data', (chunk: Buffer) => {
    stderr = (stderr + chunk.toString()).slice(-4000);
  });
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return {
    pid: child.pid,
    exited,
    stderr: () => stderr,
    /** Kills the worker and tsx with it (the whole process group), as a crash would. */
    kill: () => signal('SIGKILL'),
    running: () => child.exitCode === null && child.signalCode === null,
    async stop(timeoutMs = 10_000) {
      if (child.exitCode !== null || child.signalCode !== null) return;
      signal('SIGTERM');
      const timer = setTimeout(() => signal('SIGKILL'), timeoutMs);
      await exited;
      clearTimeout(timer);
    },
  };
}
