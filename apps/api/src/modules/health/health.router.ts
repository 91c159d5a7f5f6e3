import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { AppDeps } from '../../deps.ts';
import { RETRY_AFTER_SECONDS } from '../../http/error-handler.ts';

/** 200 when PostgreSQL and Redis answer; 503 naming the part that does not. */
export function healthRouter(deps: AppDeps): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    const [db, redis] = await Promise.all([
      withTimeout(deps.db.execute(sql`select 1`)).then(
        () => 'ok' as const,
        () => 'down' as const,
      ),
      withTimeout(deps.redis.ping()).then(
        (r) => (r === 'PONG' ? ('ok' as const) : ('down' as const)),
        () => 'down' as const,
      ),
    ]);
    const healthy = db === 'ok' && redis === 'ok';
    if (!healthy) res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
    res.status(healthy ? 200 : 503).json({ status: healthy ? 'ok' : 'degraded', db, redis });
  });
  return router;
}

function withTimeout<T>(promise: Promise<T>, ms = 2000): Promise<T> {
  return Promise.race([
    promise,
    new Promise<T>((_, reject) => setTimeout(() => reject(new Error('timeout')), ms)),
  ]);
}
