import { AppError } from '~/core/errors';
import pg from 'pg';
import { throttledErrorLog } from './connection-error-log';
import { dbConfig } from './db-config';

/**
 * One PostgreSQL LISTEN channel on a connection of its own, kept open across database
 * restarts. PostgreSQL delivers a NOTIFY only when the sending transaction commits.
 *
 * `onNotice(payload)` runs for each notice. `onGap()` runs whenever notices may have been
 * missed — the connection was lost, or it has just (re)connected — so the caller drops whatever
 * it keeps up to date from them. `listening()` is true only while the channel is open; callers
 * fall back to reading the database themselves when it is not.
 */
export interface NoticeChannel {
  listening(): boolean;
  /** True once `stop` (or `closeDb`) has closed it for good. */
  closed(): boolean;
  stop(): Promise<void>;
}

const open = new Set<NoticeChannel>();
const lostLog = throttledErrorLog('[db] notice channel lost:');
const RETRY_MIN_MS = 500;
const RETRY_MAX_MS = 15_000;

export function listenForNotices(
  channel: string,
  handlers: { onNotice: (payload: string) => void; onGap: () => void },
): NoticeChannel {
  if (!/^[a-z_][a-z0-9_]*$/.test(channel)) throw new AppError('notice_channel_name', { channel });
  let client: pg.Client | null = null;
  let up = false;
  let stopped = false;
  let retryMs = RETRY_MIN_MS;
  let timer: NodeJS.Timeout | null = null;

  const lost = (err?: unknown) => {
    if (err) lostLog(err);
    const was = client;
    client = null;
    up = false;
    handlers.onGap();
    was?.end().catch(() => undefined);
    if (stopped || timer) return;
    timer = setTimeout(() => {
      timer = null;
      void connect();
    }, retryMs);
    timer.unref();
    retryMs = Math.min(retryMs * 2, RETRY_MAX_MS);
  };

  const connect = async () => {
    if (stopped) return;
    const c = new pg.Client({ connectionString: dbConfig().databaseUrl });
    client = c;
    c.on('error', (err) => {
      if (client === c) lost(err);
    });
    c.on('end', () => {
      if (client === c && !stopped) lost();
    });
    c.on('notification', (n) => {
      if (client === c && n.channel === channel) handlers.onNotice(n.payload ?? '');
    });
    try {
      await c.connect();
      await c.query(`LISTEN ${channel}`);
      if (client !== c || stopped) return;
      // Whatever changed before LISTEN took effect was never announced to us.
      handlers.onGap();
      up = true;
      retryMs = RETRY_MIN_MS;
    } catch (err) {
      if (client === c) lost(err);
    }
  };

  const handle: NoticeChannel = {
    listening: () => up,
    closed: () => stopped,
    stop: async () => {
      stopped = true;
      up = false;
      open.delete(handle);
      if (timer) clearTimeout(timer);
      const c = client;
      client = null;
      await c?.end().catch(() => undefined);
    },
  };
  open.add(handle);
  void connect();
  return handle;
}

/** Closes every notice channel (with the pool, in `closeDb`). */
export async function stopAllNoticeChannels(): Promise<void> {
  await Promise.all([...open].map((c) => c.stop()));
}
