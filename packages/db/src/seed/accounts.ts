/**
 * Prints the demo accounts, one per line (e-mail, role, lab), without touching the database.
 * `npm start` shows them once the app is running.
 */
import { fileURLToPath } from 'node:url';
import { demoAccounts, type DemoAccount } from './demo-network.ts';

export function formatDemoAccountLines(accounts: DemoAccount[] = demoAccounts): string[] {
  const width = Math.max(...accounts.map((a) => a.email.length));
  return accounts.map((a) => {
    const lab = a.labCode ? `${a.labCode} ${a.labName}` : 'whole network';
    return `${a.email.padEnd(width)}  ${a.role.padEnd(11)}  ${lab}`;
  });
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  console.log(formatDemoAccountLines().join('\n'));
}
