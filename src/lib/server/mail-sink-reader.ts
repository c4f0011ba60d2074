import fs from 'node:fs/promises';
import path from 'node:path';

export interface CaughtMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

/** Reads what the local mail sink caught, newest first. Empty when the sink is not in use. */
export async function readCaughtMail(dir: string | undefined, limit = 200): Promise<CaughtMail[]> {
  if (!dir) return [];
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith('.json'));
  } catch {
    return [];
  }
  names.sort().reverse();
  const out: CaughtMail[] = [];
  for (const name of names.slice(0, limit)) {
    const body = JSON.parse(await fs.readFile(path.join(dir, name), 'utf8'));
    out.push({ id: name.replace(/\.json$/, ''), ...body });
  }
  return out;
}
