/**
 * Last-resort handlers: an error that escaped every request handler is logged and the API keeps
 * serving, since request state is not shared between requests. Many in a short time mean something is
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
