import fs from 'node:fs';
import path from 'node:path';

/** Reads what the local SMTP sink caught during this test run. */
export function caughtMail(): { to: string[]; subject: string; text: string; receivedAt: string }[] {
  const dir = process.env.SLUICE_MAIL_SINK_DIR;
  if (!dir || !fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((n) => n.endsWith('.json'))
    .sort()
    .map((n) => JSON.parse(fs.readFileSync(path.join(dir, n), 'utf8')));
}

/** Waits until a message to `to` whose subject matches arrives; fails after `timeoutMs`. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 10_000) {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    const hit = caughtMail().find((m) => m.to.includes(to) && subject.test(m.subject));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail to ${to} with subject ${subject} within ${timeoutMs} ms`);
}
