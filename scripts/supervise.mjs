// Keeps long-running children alive for `npm start`: a child that exits on its own is started
// again after a back-off (1 s, doubling to 30 s; back to 1 s once it has run a minute), with a
// log line each time. One child's death never stops the others; only stop() does.

/**
 * @param {string} name        shown in log lines
 * @param {() => import('node:child_process').ChildProcess} start  spawns the child
 * @param {{ log?: (msg: string) => void, minDelayMs?: number, maxDelayMs?: number, healthyAfterMs?: number }} [opts]
 */
export function supervise(name, start, opts = {}) {
  const log = opts.log ?? ((msg) => console.error(`[sluice] ${msg}`));
  const minDelayMs = opts.minDelayMs ?? 1000;
  const maxDelayMs = opts.maxDelayMs ?? 30_000;
  const healthyAfterMs = opts.healthyAfterMs ?? 60_000;
  let delayMs = minDelayMs;
  let stopping = false;
  let timer = null;
  let child = null;
  let restarts = 0;
  const listeners = [];

  function launch() {
    timer = null;
    const startedAt = Date.now();
    child = start();
    for (const l of listeners) l(child);
    child.once('exit', (code, signal) => {
      if (stopping) return;
      if (Date.now() - startedAt >= healthyAfterMs) delayMs = minDelayMs;
      restarts++;
      log(`${name} stopped unexpectedly (${signal ? `signal ${signal}` : `exit ${code}`}); starting it again in ${(delayMs / 1000).toFixed(1)} s (restart ${restarts})`);
      timer = setTimeout(launch, delayMs);
      delayMs = Math.min(delayMs * 2, maxDelayMs);
    });
  }
  launch();

  return {
    name,
    /** The running child (a new object after each restart). */
    get child() {
      return child;
    },
    get restarts() {
      return restarts;
    },
    /** Calls `fn` with each child started from now on. */
    onStart(fn) {
      listeners.push(fn);
    },
    /** Stops supervising and ends the child: SIGTERM, then SIGKILL after `graceMs`. */
    stop(graceMs = 10_000) {
      stopping = true;
      if (timer) clearTimeout(timer);
      const c = child;
      if (!c || c.exitCode !== null || c.signalCode !== null) return Promise.resolve();
      return new Promise((resolve) => {
        const kill = setTimeout(() => c.kill('SIGKILL'), graceMs);
        c.once('exit', () => {
          clearTimeout(kill);
          resolve();
        });
        c.kill('SIGTERM');
      });
    },
  };
}
