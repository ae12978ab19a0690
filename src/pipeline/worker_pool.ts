/**
 * A small pool of Web Workers of our own: one task per worker at a time, tasks pulled
 * lazily (so memory stays bounded by the pool size, not the fleet), a timeout per task,
 * and a crashed or hung worker replaced with its task retried once before it is reported
 * failed. Every task ends in exactly one outcome.
 *
 * Messages: the pool sends { kind: "init", init } once per worker, then
 * { kind: "task", id, payload } (payload transferred); the worker answers
 * { kind: "done", id, value, ms? } or { kind: "failed", id, message }.
 */

export interface PoolTask<I> {
  readonly id: string;
  readonly payload: I;
  /** Buffers to transfer with the payload (the pool keeps a clone for a retry). */
  readonly transfer: ArrayBuffer[];
}

export type PoolOutcome<O> =
  | {
    readonly id: string;
    readonly ok: true;
    readonly value: O;
    readonly attempts: number;
    /** Time the worker reports it spent on the task, ms (0 when it reports none). */
    readonly workMs: number;
  }
  | { readonly id: string; readonly ok: false; readonly reason: string; readonly attempts: number };

export interface PoolOptions {
  readonly workerUrl: URL;
  readonly workers: number;
  /** Longest a single task may take before its worker is replaced, ms. */
  readonly timeoutMs: number;
  /** Sent to every worker before its first task. */
  readonly init: unknown;
}

interface Slot {
  worker: Worker;
  busy: boolean;
}

type WorkerMessage<O> =
  | { kind: "done"; id: string; value: O; ms?: number }
  | { kind: "failed"; id: string; message: string };

/** Runs every task; `onOutcome` is awaited in completion order. */
export async function runPool<I, O>(
  tasks: Iterable<PoolTask<I>> | AsyncIterable<PoolTask<I>>,
  options: PoolOptions,
  onOutcome: (outcome: PoolOutcome<O>) => void | Promise<void>,
): Promise<void> {
  const spawn = (): Worker => {
    const w = new Worker(options.workerUrl.href, { type: "module" });
    w.postMessage({ kind: "init", init: options.init });
    return w;
  };
  const slots: Slot[] = Array.from({ length: Math.max(1, options.workers) }, () => ({
    worker: spawn(),
    busy: false,
  }));
  const iterator =
    (Symbol.asyncIterator in tasks
      ? (tasks as AsyncIterable<PoolTask<I>>)[Symbol.asyncIterator]()
      : (tasks as Iterable<PoolTask<I>>)[Symbol.iterator]()) as
        | AsyncIterator<PoolTask<I>>
        | Iterator<PoolTask<I>>;
  let pending = Promise.resolve();
  const report = (o: PoolOutcome<O>) => {
    pending = pending.then(() => onOutcome(o));
  };

  /** Runs one task on a slot; resolves with the outcome of this attempt. */
  const attempt = (slot: Slot, task: PoolTask<I>): Promise<PoolOutcome<O> | { retry: string }> =>
    new Promise((resolve) => {
      const w = slot.worker;
      let settled = false;
      const finish = (r: PoolOutcome<O> | { retry: string }, replace: boolean) => {
        if (settled) return;
        settled = true;
        clearTimeout(timer);
        w.onmessage = null;
        w.onerror = null;
        if (replace) {
          w.terminate();
          slot.worker = spawn();
        }
        resolve(r);
      };
      const timer = setTimeout(
        () => finish({ retry: `timed out after ${options.timeoutMs} ms` }, true),
        options.timeoutMs,
      );
      w.onmessage = (e: MessageEvent<WorkerMessage<O>>) => {
        const m = e.data;
        if (m.id !== task.id) return;
        if (m.kind === "done") {
          finish({ id: task.id, ok: true, value: m.value, attempts: 1, workMs: m.ms ?? 0 }, false);
        } else finish({ id: task.id, ok: false, reason: m.message, attempts: 1 }, false);
      };
      w.onerror = (e: ErrorEvent) => {
        e.preventDefault();
        finish({ retry: `worker crashed: ${e.message}` }, true);
      };
      w.postMessage({ kind: "task", id: task.id, payload: task.payload }, task.transfer);
    });

  const runTask = async (slot: Slot, task: PoolTask<I>): Promise<void> => {
    const spare = structuredClone(task.payload);
    const first = await attempt(slot, task);
    if (!("retry" in first)) return report(first);
    const second = await attempt(slot, { id: task.id, payload: spare, transfer: [] });
    if (!("retry" in second)) return report({ ...second, attempts: 2 });
    report({
      id: task.id,
      ok: false,
      reason: `${first.retry}; on retry ${second.retry}`,
      attempts: 2,
    });
  };

  const loop = async (slot: Slot): Promise<void> => {
    for (;;) {
      const next = await iterator.next();
      if (next.done) return;
      slot.busy = true;
      await runTask(slot, next.value);
      slot.busy = false;
      await pending;
    }
  };
  try {
    await Promise.all(slots.map(loop));
    await pending;
  } finally {
    for (const s of slots) s.worker.terminate();
  }
}
