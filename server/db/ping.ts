import type { DataSource } from "typeorm";

// One initialize() at a time per DataSource, however many pings wait on it.
const connecting = new WeakMap<DataSource, Promise<unknown>>();

/**
 * True when the database answers `SELECT 1` within timeoutMs. A DataSource that
 * could not connect at start is initialized here, so the app recovers by itself.
 */
export async function pingDatabase(db: DataSource, timeoutMs: number): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs);
  });
  const ping = (async () => {
    if (!db.isInitialized) {
      let pending = connecting.get(db);
      if (!pending) {
        pending = db.initialize().finally(() => connecting.delete(db));
        connecting.set(db, pending);
      }
      await pending;
    }
    await db.query("SELECT 1");
    return true;
  })().catch(() => false);
  try {
    return await Promise.race([ping, timeout]);
  } finally {
    clearTimeout(timer);
  }
}
