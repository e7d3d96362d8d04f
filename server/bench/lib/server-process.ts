/** Starts server/bench/lib/serve.ts in a child process and reads its CPU time on demand. */
import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export interface BenchServer {
  url: string;
  /** user + system CPU microseconds the server process has used so far */
  cpuMicros(): Promise<number>;
  stop(): Promise<void>;
}

export async function startBenchServer(env: Record<string, string> = {}): Promise<BenchServer> {
  const script = fileURLToPath(new URL('./serve.ts', import.meta.url));
  const child: ChildProcess = fork(script, [], { execArgv: ['--import', 'tsx', ...(process.env.BENCH_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_CPU_PROF}`] : [])], env: { ...process.env, ...env }, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
  const port = await new Promise<number>((resolve, reject) => {
    const onMessage = (m: { kind: string; port?: number }) => {
      if (m.kind === 'listening') {
        child.off('message', onMessage);
        resolve(m.port!);
      }
    };
    child.on('message', onMessage);
    child.once('exit', (code) => reject(new Error(`bench server exited with ${code}`)));
  });
  const ask = <T>(kind: string) =>
    new Promise<T>((resolve) => {
      const onMessage = (m: { kind: string } & T) => {
        if (m.kind === kind) {
          child.off('message', onMessage);
          resolve(m);
        }
      };
      child.on('message', onMessage);
      child.send({ kind });
    });
  return {
    url: `http://127.0.0.1:${port}`,
    async cpuMicros() {
      const { usage } = await ask<{ usage: NodeJS.CpuUsage }>('cpu');
      return usage.user + usage.system;
    },
    async stop() {
      if (child.exitCode !== null) return;
      const exited = new Promise((resolve) => child.once('exit', resolve));
      child.send({ kind: 'stop' });
      const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
      await exited;
      clearTimeout(timer);
    },
  };
}
