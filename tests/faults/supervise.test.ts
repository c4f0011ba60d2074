import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { supervise } from '../../scripts/supervise.mjs';
import { waitFor } from './harness';

/** What `npm start` does with its children: restart the one that died, leave the others alone. */
describe('the supervisor of npm start', () => {
  it('restarts a child that dies, with growing waits, while the others run on; stop() ends all', async () => {
    const lines: string[] = [];
    const log = (m: string) => lines.push(m);
    // A child that dies at once every time, and one that runs until stopped.
    const dying = supervise('dying', () => spawn(process.execPath, ['-e', 'process.exit(3)']), { log, minDelayMs: 100, maxDelayMs: 800 });
    const steady = supervise('steady', () => spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)']), { log, minDelayMs: 100 });
    const steadyPid = steady.child.pid;

    await waitFor(() => dying.restarts >= 4, 10_000, 'four restarts');
    expect(lines[0]).toBe('dying stopped unexpectedly (exit 3); starting it again in 0.1 s (restart 1)');
    expect(lines.slice(0, 4).map((l) => /in ([\d.]+) s/.exec(l)![1])).toEqual(['0.1', '0.2', '0.4', '0.8']);
    expect(steady.child.pid).toBe(steadyPid);
    expect(steady.child.exitCode).toBeNull();

    // kill -9 of the steady one: it comes back as a new process.
    steady.child.kill('SIGKILL');
    await waitFor(() => steady.restarts === 1 && steady.child.pid !== steadyPid && steady.child.exitCode === null, 5_000, 'the steady child back');
    expect(lines.some((l) => l.startsWith('steady stopped unexpectedly (signal SIGKILL)'))).toBe(true);

    const last = steady.child;
    await Promise.all([dying.stop(2000), steady.stop(2000)]);
    expect(last.signalCode).toBe('SIGTERM');
    const restarts = dying.restarts;
    await new Promise((r) => setTimeout(r, 1000));
    expect(dying.restarts).toBe(restarts);
  });
});
