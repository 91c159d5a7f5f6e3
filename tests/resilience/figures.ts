import { appendFileSync } from 'node:fs';

/**
 * Records one measured figure of the resilience suite: printed at once, and appended to
 * RESILIENCE_FIGURES_FILE when set, so `npm run test:resilience` can print them all at the end.
 */
export function recordFigure(name: string, figure: string): void {
  console.log(`resilience: ${name}: ${figure}`);
  const file = process.env.RESILIENCE_FIGURES_FILE;
  if (file) appendFileSync(file, `${name}: ${figure}\n`);
}
