/**
 * The page's side of the worker protocol: each request becomes a `Job` — a promise of its result,
 * progress and chunk callbacks, and `cancel()`. Nothing here knows about React.
 */
import { withPackedLevels, type PackedLevels } from './packed-levels.ts';
import {
  Cancelled,
  WorkerProblem,
  type CallKind,
  type FromWorker,
  type OpenedTable,
  type Phase,
  type Reprofiled,
  type RequestOf,
  type ResultOf,
  type ToWorker,
} from './protocol.ts';

/** The part of a Worker (or an in-page stand-in) the client needs. */
export interface WorkerPort {
  postMessage(message: ToWorker, transfer?: Transferable[]): void;
  addEventListener(type: 'message', listener: (event: MessageEvent<FromWorker>) => void): void;
  addEventListener(type: 'error', listener: (event: ErrorEvent) => void): void;
  terminate?(): void;
}

export interface Progress {
  readonly phase: Phase;
  readonly done: number;
  readonly total: number | null;
}

export interface JobHandlers {
  onProgress?(progress: Progress): void;
  /** Export parts, in order. */
  onChunk?(bytes: Uint8Array): void;
  /** Export parts as Blobs, in order, when the export asked for `parts: 'blobs'`. */
  onBlob?(blob: Blob): void;
}

export interface Job<T> {
  readonly id: number;
  /** Resolves with the result; rejects with WorkerProblem, or Cancelled after cancel(). */
  readonly result: Promise<T>;
  cancel(): void;
}

interface Pending {
  resolve(result: unknown): void;
  reject(error: unknown): void;
  handlers: JobHandlers;
  /** Packed runs of profile levels that came ahead of an `open` or `reprofile` answer, by column. */
  levelRuns?: Map<number, PackedLevels[]>;
}

type Payload<K extends CallKind> = Omit<RequestOf<K>, 'type'>;

export class WorkbenchClient {
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();

  constructor(private readonly port: WorkerPort) {
    port.addEventListener('message', (event) => this.receive(event.data));
    port.addEventListener('error', (event) => this.failAll(event.message || 'The background worker stopped unexpectedly.'));
  }

  start<K extends CallKind>(type: K, payload: Payload<K>, handlers: JobHandlers = {}): Job<ResultOf<K>> {
    const id = this.nextId++;
    const result = new Promise<ResultOf<K>>((resolve, reject) => {
      this.pending.set(id, { resolve: resolve as (r: unknown) => void, reject, handlers });
    });
    // The cast joins a payload to its `type`; TypeScript cannot see that K selects one member of the union.
    this.port.postMessage({ ...payload, type, id } as unknown as ToWorker);
    return { id, result, cancel: () => this.cancel(id) };
  }

  call<K extends CallKind>(type: K, payload: Payload<K>, handlers?: JobHandlers): Promise<ResultOf<K>> {
    return this.start(type, payload, handlers).result;
  }

  cancel(id: number): void {
    const pending = this.pending.get(id);
    if (!pending) return;
    this.pending.delete(id);
    this.port.postMessage({ type: 'cancel', id });
    pending.reject(new Cancelled());
  }

  dispose(): void {
    this.failAll('The workbench was closed.');
    this.port.terminate?.();
  }

  private receive(message: FromWorker): void {
    const pending = this.pending.get(message.id);
    if (!pending) return; // an answer to a cancelled request
    switch (message.type) {
      case 'progress':
        pending.handlers.onProgress?.({ phase: message.phase, done: message.done, total: message.total });
        return;
      case 'chunk':
        pending.handlers.onChunk?.(message.bytes);
        return;
      case 'blob':
        pending.handlers.onBlob?.(message.blob);
        return;
      case 'levels': {
        pending.levelRuns ??= new Map();
        const runs = pending.levelRuns.get(message.column) ?? [];
        runs.push(message.levels);
        pending.levelRuns.set(message.column, runs);
        return;
      }
      case 'done':
        this.pending.delete(message.id);
        pending.resolve(pending.levelRuns ? withLevelRuns(message.result as OpenedTable | Reprofiled, pending.levelRuns) : message.result);
        return;
      case 'failed':
        this.pending.delete(message.id);
        pending.reject(new WorkerProblem(message.problem));
        return;
      case 'cancelled':
        this.pending.delete(message.id);
        pending.reject(new Cancelled());
        return;
    }
  }

  private failAll(message: string): void {
    for (const [id, pending] of this.pending) {
      this.pending.delete(id);
      pending.reject(new WorkerProblem({ code: 'worker-stopped', message, hint: 'Reload the page and open the file again.' }));
    }
  }
}

/** An `open` or `reprofile` answer with the level runs that came ahead of it given back to their profiles. */
function withLevelRuns<T extends OpenedTable | Reprofiled>(table: T, runs: ReadonlyMap<number, PackedLevels[]>): T {
  const profiles = table.profiles.map((profile, column) => {
    const packed = runs.get(column);
    return packed === undefined ? profile : withPackedLevels(profile, packed);
  });
  return { ...table, profiles };
}

/** A client over the real worker. */
export function startWorkbenchWorker(): WorkbenchClient {
  const worker = new Worker(new URL('./workbench.worker.ts', import.meta.url), { type: 'module', name: 'levelwise' });
  // A Worker is a WorkerPort; the DOM typings' overloaded addEventListener just does not say so.
  return new WorkbenchClient(worker as unknown as WorkerPort);
}
