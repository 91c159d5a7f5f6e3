import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const repoRoot = fileURLToPath(new URL('../../../../', import.meta.url));
// The worker is another app: tests run it as a process (the way it is deployed), never import it.
const workerMain = fileURLToPath(new URL('../../../worker/src/main.ts', import.meta.url));

export type WorkerProcess = { child: ChildProcess; output: () => string; stop: () => Promise<void> };

/** Runs the ingest worker against a test app's database, storage directory and queue prefix. */
export async function spawnWorkerFor(
  t: {
    databaseUrl: string;
    storageDir: string;
    queuePrefix: string;
    env: { REDIS_URL: string };
  },
  extraEnv: Record<string, string> = {},
): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', workerMain], {
    cwd: repoRoot,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      // The worker's JSON log is silent under test unless asked; its "ready" line is awaited below.
      LOG_LEVEL: 'info',
      DATABASE_URL: t.databaseUrl,
      REDIS_URL: t.env.REDIS_URL,
      QUEUE_PREFIX: t.queuePrefix,
      STORAGE_DIR: t.storageDir,
      S3_BUCKET: '',
      RECOVERY_INTERVAL_MS: '600000',
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not start:\n${output}`)), 30_000);
    child.stdout!.on('data', () => {
      if (/"name":"worker"[^\n]*"msg":"ready/.test(output)) {
        clearTimeout(timer);
        resolve();
      }
    });
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
  };
}
