/**
 * Last-resort handlers: an error that escaped every job (a dropped connection emitting an error
 * nobody awaited, say) is logged and the worker keeps going; each job's own failure is handled by the
 * queue, and PostgreSQL rolls back whatever a broken job left open. Many in a short time mean something is
 * broken for good; then the process exits and its supervisor starts a fresh one.
 */
export function installProcessGuards(name: string, options = { maxPerMinute: 20 }): void {
  let recent: number[] = [];
  const report = (kind: string, error: unknown) => {
    const now = Date.now();
    recent = [...recent.filter((at) => now - at < 60_000), now];
    const detail = error instanceof Error ? (error.stack ?? error.message) : String(error);
    console.error(`${name}: ${kind} (kept running): ${detail}`);
    if (recent.length > options.maxPerMinute) {
      console.error(
        `${name}: ${recent.length} unexpected errors within a minute; exiting so the supervisor restarts it`,
      );
      process.exit(1);
    }
  };
  process.on('uncaughtException', (error) => report('uncaught exception', error));
  process.on('unhandledRejection', (reason) => report('unhandled rejection', reason));
}
