// One solve thread of the pool (lib/solve-pool/index.ts). Plain ESM so node starts it as is; the
// TypeScript engine is loaded through tsx's scoped loader (tsconfig paths included), once per
// thread. Each message is one task; the answer carries the same id.
import { readlinkSync } from 'node:fs';
import { getPriority, setPriority } from 'node:os';
import { parentPort, workerData } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

// Lower this thread's scheduling priority (Linux: setpriority on the thread id, which touches
// this thread only), so the request thread and the database go first when the cores are busy.
function lowerPriority() {
  try {
    const tid = Number(readlinkSync('/proc/thread-self').split('/').pop());
    if (!Number.isInteger(tid) || tid <= 0) return { tid: null, nice: null };
    setPriority(tid, Math.max(getPriority(tid), Number(workerData?.nice ?? 10)));
    return { tid, nice: getPriority(tid) };
  } catch {
    return { tid: null, nice: null }; // not Linux, or not allowed: the thread keeps the process's priority
  }
}
const { tid, nice } = lowerPriority();

const { tasks } = await tsImport('./tasks.ts', import.meta.url);

parentPort.on('message', (msg) => {
  const { id, name, args } = msg;
  let reply;
  try {
    const fn = Object.hasOwn(tasks, name) ? tasks[name] : undefined;
    if (typeof fn !== 'function') throw new Error(`unknown solve task ${String(name)}`);
    reply = { id, ok: true, value: fn(...args) };
  } catch (e) {
    reply = { id, ok: false, error: e instanceof Error ? e.message : String(e) };
  }
  try {
    parentPort.postMessage(reply);
  } catch (e) {
    parentPort.postMessage({ id, ok: false, error: `the result could not be sent back: ${e instanceof Error ? e.message : String(e)}` });
  }
});
parentPort.postMessage({ ready: true, tid, nice });
