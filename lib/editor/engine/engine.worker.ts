/**
 * The engine worker script (module worker). It runs the compiler and the solver off the main
 * thread; each message is answered by `handleEngineRequest` (see `run.ts` and `protocol.ts`).
 * An unexpected exception inside the engine is reported as `cannot-solve` so the editor never
 * waits on a reply that will not come.
 */
import { handleEngineRequest } from './run';
import type { EngineReply } from './protocol';

/** The part of the worker global scope this script uses (the project's TS lib is DOM, not WebWorker). */
interface WorkerScope {
  postMessage(message: EngineReply): void;
  addEventListener(type: 'message', listener: (event: MessageEvent<unknown>) => void): void;
}

const scope = self as unknown as WorkerScope;

scope.addEventListener('message', (event) => {
  const data = event.data;
  try {
    handleEngineRequest(data, (reply) => scope.postMessage(reply));
  } catch (e) {
    const version = data && typeof data === 'object' && 'version' in data && Number.isInteger((data as { version: unknown }).version) ? (data as { version: number }).version : 0;
    scope.postMessage({ type: 'cannot-solve', version, reason: `engine error: ${e instanceof Error ? e.message : String(e)}`, timings: {} });
  }
});
