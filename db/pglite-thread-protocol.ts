// Messages between the web server's thread (db/pglite-thread.ts) and the database thread (db/pglite-thread-entry.ts).

export type RowMode = "object" | "array";

export type DatabaseRequest =
  | {
      id: number;
      op: "query";
      sql: string;
      params: unknown[];
      rowMode: RowMode;
      /** type ids whose text is passed through unparsed (drizzle parses timestamps, dates and intervals itself) */
      rawTypes: number[];
      /** the open transaction this query belongs to; none: queued behind any open transaction */
      transaction?: number;
    }
  | { id: number; op: "exec"; sql: string; transaction?: number }
  | { id: number; op: "begin" }
  | { id: number; op: "end"; transaction: number; commit: boolean }
  | { id: number; op: "close" };

/** A database error as plain data: message plus PostgreSQL's fields (code, detail, constraint…). */
export interface DatabaseErrorData {
  name: string;
  message: string;
  fields: Record<string, string | number | boolean>;
}

export type DatabaseReply = { id: number; ok: true; result: unknown } | { id: number; ok: false; error: DatabaseErrorData };

export interface DatabaseThreadData {
  /** PGlite data folder; absent: in memory */
  dataDir?: string;
}

/** First message of the thread: the database is open, or why it could not open. */
export type DatabaseThreadReady = { ready: true } | { ready: false; error: DatabaseErrorData };

export function errorToData(error: unknown): DatabaseErrorData {
  if (!(error instanceof Error)) return { name: "Error", message: String(error), fields: {} };
  const fields: DatabaseErrorData["fields"] = {};
  for (const [key, value] of Object.entries(error)) {
    if (typeof value === "string" || typeof value === "number" || typeof value === "boolean") fields[key] = value;
  }
  return { name: error.name, message: error.message, fields };
}

export function errorFromData(data: DatabaseErrorData): Error {
  const error = Object.assign(new Error(data.message), data.fields);
  error.name = data.name;
  return error;
}
