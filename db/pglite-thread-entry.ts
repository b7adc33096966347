// Entry of the database thread (bundled by scripts/build-worker.mjs into dist/database-worker.mjs). PGlite runs here,
// so the web server's thread spends no time inside the database engine: it sends SQL and receives rows.
// PGlite serialises everything behind one lock, so a query that is not part of the open transaction waits for it,
// exactly as it would in the server's own thread.
import { parentPort, workerData } from "node:worker_threads";
import { PGlite, type QueryOptions, type Transaction } from "@electric-sql/pglite";
import { pgliteOptions } from "./pglite-options";
import { errorToData, type DatabaseReply, type DatabaseRequest, type DatabaseThreadData } from "./pglite-thread-protocol";

const port = parentPort!;
const { dataDir } = workerData as DatabaseThreadData;

interface OpenTransaction {
  tx: Transaction;
  finish: (commit: boolean) => void;
  settled: Promise<unknown>;
}

const ROLLBACK = Symbol("rollback");
const transactions = new Map<number, OpenTransaction>();
let nextTransactionId = 1;

const passThrough = (value: string) => value;

function queryOptions(rowMode: QueryOptions["rowMode"], rawTypes: number[]): QueryOptions {
  return { rowMode, parsers: Object.fromEntries(rawTypes.map((typeId) => [typeId, passThrough])) };
}

function target(pg: PGlite, transaction: number | undefined) {
  if (transaction === undefined) return pg;
  const open = transactions.get(transaction);
  if (!open) throw new Error(`transaction ${transaction} is not open`);
  return open.tx;
}

/** Starts a transaction and answers with its id once inside it (after any transaction before it has ended). */
function begin(pg: PGlite): Promise<number> {
  return new Promise((resolveBegin, rejectBegin) => {
    let id = 0;
    const settled = pg
      .transaction(
        (tx) =>
          new Promise((commit, rollback) => {
            id = nextTransactionId++;
            transactions.set(id, { tx, finish: (ok) => (ok ? commit(undefined) : rollback(ROLLBACK)), settled });
            resolveBegin(id);
          }),
      )
      .finally(() => transactions.delete(id));
    settled.catch((error) => {
      if (id === 0) rejectBegin(error);
    });
  });
}

async function end(transaction: number, commit: boolean) {
  const open = transactions.get(transaction);
  if (!open) throw new Error(`transaction ${transaction} is not open`);
  open.finish(commit);
  try {
    await open.settled;
  } catch (error) {
    if (error !== ROLLBACK) throw error;
  }
  return null;
}

async function handle(pg: PGlite, request: DatabaseRequest): Promise<unknown> {
  switch (request.op) {
    case "query": {
      const { rows, fields, affectedRows } = await target(pg, request.transaction).query(
        request.sql,
        request.params,
        queryOptions(request.rowMode, request.rawTypes),
      );
      return { rows, fields, affectedRows };
    }
    case "exec":
      return (await target(pg, request.transaction).exec(request.sql)).map(({ rows, fields, affectedRows }) => ({ rows, fields, affectedRows }));
    case "begin":
      return begin(pg);
    case "end":
      return end(request.transaction, request.commit);
    case "close":
      await pg.close();
      return null;
  }
}

async function main() {
  let pg: PGlite;
  try {
    pg = new PGlite(dataDir, pgliteOptions);
    await pg.waitReady;
  } catch (error) {
    port.postMessage({ ready: false, error: errorToData(error) });
    return;
  }
  port.on("message", (request: DatabaseRequest) => {
    handle(pg, request).then(
      (result) => port.postMessage({ id: request.id, ok: true, result } satisfies DatabaseReply),
      (error) => port.postMessage({ id: request.id, ok: false, error: errorToData(error) } satisfies DatabaseReply),
    );
  });
  port.postMessage({ ready: true });
}

void main();
