import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const repoRoot = fileURLToPath(new URL('../../../../', import.meta.url));
const workerMain = fileURLToPath(new URL('../main.ts', import.meta.url));

export type WorkerProcess = {
  child: ChildProcess;
  output: () => string;
  stop: () => Promise<void>;
  kill: () => Promise<void>;
};

/** Runs the real worker (src/main.ts) as a child process and resolves once it says it is ready. */
export async function spawnWorkerProcess(env: Record<string, string>): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', workerMain], {
    cwd: repoRoot,
    // LOG_LEVEL: the worker's JSON log is silent under test unless asked; its "ready" line is awaited.
    env: { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'info', RECOVERY_INTERVAL_MS: '600000', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not start:\n${output}`)), 30_000);
    const check = () => {
      if (/"name":"worker"[^\n]*"msg":"ready/.test(output)) {
        clearTimeout(timer);
        resolve();
      }
    };
    child.stdout!.on('data', check);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`worker exited with ${code}:\n${output}`));
    });
  });
  return {
    child,
    output: () => output,
    async stop() {
      if (child.exitCode === null) child.kill('SIGTERM');
      await exited;
    },
    async kill() {
      if (child.exitCode === null) child.kill('SIGKILL');
      await exited;
    },
  };
}
