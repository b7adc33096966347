import "server-only";
import { existsSync } from "node:fs";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { QueryOptions, Results } from "@electric-sql/pglite";
import { errorFromData, type DatabaseReply, type DatabaseRequest, type DatabaseThreadData, type DatabaseThreadReady } from "./pglite-thread-protocol";

const WORKER_FILE = path.join(/*turbopackIgnore: true*/ process.cwd(), "dist", "database-worker.mjs");

type Request = DatabaseRequest extends infer R ? (R extends { id: number } ? Omit<R, "id"> : never) : never;

/** What drizzle's PGlite driver uses of a PGlite client: query, exec and transaction. */
export interface QueryClient {
  query<T>(sql: string, params?: unknown[], options?: QueryOptions): Promise<Results<T>>;
  exec(sql: string): Promise<Results[]>;
}

/**
 * PGlite on its own thread, with the client surface drizzle's PGlite driver needs. The web server's thread then only
 * sends SQL and receives rows (structured clones); the database engine's work (planning, executing, reading and
 * writing pages) runs on the other core. Transactions hold PGlite's lock on that thread from begin to end, so other
 * queries wait for them as they would in-process.
 */
export class ThreadedPGlite implements QueryClient {
  private nextId = 1;
  private readonly pending = new Map<number, { resolve: (value: unknown) => void; reject: (error: Error) => void }>();
  private stopped: Error | null = null;
  private closing = false;

  private constructor(private readonly worker: Worker) {
    worker.on("message", (reply: DatabaseReply) => {
      const waiting = this.pending.get(reply.id);
      if (!waiting) return;
      this.pending.delete(reply.id);
      if (this.pending.size === 0) worker.unref();
      if (reply.ok) waiting.resolve(reply.result);
      else waiting.reject(errorFromData(reply.error));
    });
    const stop = (error: Error) => {
      if (!this.stopped && !this.closing) console.error(`slipfield: ${error.message}; database requests fail until the server is restarted`);
      this.stopped ??= error;
      for (const waiting of this.pending.values()) waiting.reject(this.stopped);
      this.pending.clear();
    };
    worker.on("error", (error) => stop(new Error(`the database thread failed: ${error.message}`)));
    worker.on("exit", (code) => stop(new Error(`the database thread stopped (exit code ${code})`)));
  }

  /** Opens PGlite on a new thread: in the folder `dataDir`, or in memory without one. */
  static async open(dataDir?: string, workerFile = WORKER_FILE): Promise<ThreadedPGlite> {
    if (!existsSync(workerFile)) throw new Error(`${workerFile} is missing: run \`npm run build\` (or node scripts/build-worker.mjs) first`);
    const worker = new Worker(/*turbopackIgnore: true*/ workerFile, { workerData: { dataDir } satisfies DatabaseThreadData });
    const ready = await new Promise<DatabaseThreadReady>((resolve, reject) => {
      const onExit = (code: number) => reject(new Error(`the database thread stopped while opening (exit code ${code})`));
      worker.once("error", reject);
      worker.once("exit", onExit);
      worker.once("message", (message: DatabaseThreadReady) => {
        worker.off("error", reject);
        worker.off("exit", onExit);
        resolve(message);
      });
    });
    if (!ready.ready) {
      await worker.terminate();
      throw errorFromData(ready.error);
    }
    worker.unref();
    return new ThreadedPGlite(worker);
  }

  private call<T>(request: Request): Promise<T> {
    if (this.stopped) return Promise.reject(this.stopped);
    const id = this.nextId++;
    return new Promise<T>((resolve, reject) => {
      this.pending.set(id, { resolve: resolve as (value: unknown) => void, reject });
      if (this.pending.size === 1) this.worker.ref(); // a query in flight keeps the process alive
      this.worker.postMessage({ ...request, id });
    });
  }

  query<T>(sql: string, params: unknown[] = [], options: QueryOptions = {}, transaction?: number): Promise<Results<T>> {
    const rawTypes = Object.keys(options.parsers ?? {}).map(Number);
    return this.call({ op: "query", sql, params, rowMode: options.rowMode ?? "object", rawTypes, transaction });
  }

  exec(sql: string, transaction?: number): Promise<Results[]> {
    return this.call({ op: "exec", sql, transaction });
  }

  /**
   * Runs `callback` inside one transaction: committed when it resolves, rolled back when it throws. Parsers passed to
   * queries must only pass text through (drizzle's are): functions cannot cross to the database thread.
   */
  async transaction<T>(callback: (tx: QueryClient) => Promise<T>): Promise<T> {
    const transaction = await this.call<number>({ op: "begin" });
    const tx: QueryClient = {
      query: (sql, params, options) => this.query(sql, params, options, transaction),
      exec: (sql) => this.exec(sql, transaction),
    };
    let result: T;
    try {
      result = await callback(tx);
    } catch (error) {
      await this.call({ op: "end", transaction, commit: false }).catch(() => undefined);
      throw error;
    }
    await this.call({ op: "end", transaction, commit: true });
    return result;
  }

  async close(): Promise<void> {
    this.closing = true;
    if (!this.stopped) await this.call({ op: "close" }).catch(() => undefined);
    await this.worker.terminate();
  }
}
