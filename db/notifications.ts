import "server-only";
import { randomUUID } from "node:crypto";
import { sql } from "drizzle-orm";
import { getDatabaseHandle } from "./client";

/**
 * Signals between the processes that share one database: PostgreSQL's LISTEN/NOTIFY on a PostgreSQL server, plain
 * in-process calls on the embedded PGlite (only one process can open it). Used to wake job workers when a job is
 * added, and to make every process forget remembered roles and sessions when they change.
 *
 * A process listens on one connection of its own. While that connection is down, notifications can be missed, so
 * subscribers are told (`onStateChange(false)`) and must not trust what they remember until it is back
 * (`onStateChange(true)`, after which they start afresh).
 */

export type Channel = "slipfield_jobs" | "slipfield_roles" | "slipfield_sessions";
type Listener = (payload: string) => void;
type StateListener = (listening: boolean) => void;

interface Hub {
  listeners: Map<Channel, Set<Listener>>;
  stateListeners: Set<StateListener>;
  /** PostgreSQL only: the LISTEN connection, once opened */
  connection: Promise<void> | null;
  listening: boolean;
  client: import("pg").Client | null;
  stopped: boolean;
}

// on globalThis: route handlers, pages and server actions are separate bundles that must share one connection
const hub: Hub = ((globalThis as unknown as { slipfieldNotifications?: Hub }).slipfieldNotifications ??= {
  listeners: new Map(),
  stateListeners: new Set(),
  connection: null,
  listening: false,
  client: null,
  stopped: false,
});

const CHANNELS: Channel[] = ["slipfield_jobs", "slipfield_roles", "slipfield_sessions"];
const RECONNECT_MS = 1000;

function dispatch(channel: Channel, payload: string) {
  for (const listener of hub.listeners.get(channel) ?? []) {
    try {
      listener(payload);
    } catch (error) {
      console.error(`slipfield: a ${channel} listener failed:`, error);
    }
  }
}

function setListening(listening: boolean) {
  if (hub.listening === listening) return;
  hub.listening = listening;
  for (const listener of hub.stateListeners) listener(listening);
}

async function connect(url: string): Promise<void> {
  const { Client } = await import("pg");
  const client = new Client({ connectionString: url, application_name: "slipfield-listen" });
  client.on("notification", (message) => {
    if (CHANNELS.includes(message.channel as Channel)) dispatch(message.channel as Channel, message.payload ?? "");
  });
  const lost = () => {
    if (hub.client !== client) return;
    hub.client = null;
    setListening(false);
    void client.end().catch(() => undefined);
    if (!hub.stopped) setTimeout(() => void connect(url).catch(() => undefined), RECONNECT_MS).unref();
  };
  client.on("error", lost);
  client.on("end", lost);
  try {
    await client.connect();
    for (const channel of CHANNELS) await client.query(`LISTEN ${channel}`);
  } catch (error) {
    client.removeAllListeners("end");
    await client.end().catch(() => undefined);
    if (!hub.stopped) setTimeout(() => void connect(url).catch(() => undefined), RECONNECT_MS).unref();
    throw error;
  }
  // the connection must not keep a process alive that has nothing else to do
  (client as unknown as { connection?: { stream?: { unref?: () => void } } }).connection?.stream?.unref?.();
  hub.client = client;
  setListening(true);
}

/**
 * Starts listening (PostgreSQL) and reports whether notifications are being received now. On the embedded database
 * every signal stays inside this process, so it always "listens".
 */
export async function startListening(): Promise<boolean> {
  const handle = await getDatabaseHandle();
  if (handle.kind === "pglite") return true;
  if (!handle.url) return false;
  hub.stopped = false;
  hub.connection ??= connect(handle.url).catch(() => undefined);
  await hub.connection;
  return hub.listening;
}

/** Whether a notification sent now by another process would reach this one. */
export async function isListening(): Promise<boolean> {
  const handle = await getDatabaseHandle();
  return handle.kind === "pglite" || hub.listening;
}

export function subscribe(channel: Channel, listener: Listener): () => void {
  let set = hub.listeners.get(channel);
  if (!set) hub.listeners.set(channel, (set = new Set()));
  set.add(listener);
  return () => set!.delete(listener);
}

export function onListeningChange(listener: StateListener): () => void {
  hub.stateListeners.add(listener);
  return () => hub.stateListeners.delete(listener);
}

/**
 * Sends `payload` on `channel` to every process (this one included). With `echo`, waits until this process has
 * received it back (at most `echoTimeoutMs`): PostgreSQL delivers a notification to all listeners at once, so by then
 * the others have it too (or are about to), which lets a change answer only after every process was told.
 */
export async function publish(channel: Channel, payload = "", options: { echo?: boolean; echoTimeoutMs?: number } = {}): Promise<void> {
  const handle = await getDatabaseHandle();
  if (handle.kind === "pglite") {
    dispatch(channel, payload);
    return;
  }
  if (!options.echo || !hub.listening) {
    await handle.db.execute(sql`select pg_notify(${channel}, ${payload})`);
    return;
  }
  const tagged = `${payload}#${randomUUID()}`;
  let unsubscribe = () => {};
  const echoed = new Promise<void>((resolve) => {
    const timer = setTimeout(resolve, options.echoTimeoutMs ?? 2000);
    timer.unref();
    unsubscribe = subscribe(channel, (received) => {
      if (received === tagged) {
        clearTimeout(timer);
        resolve();
      }
    });
  });
  try {
    await handle.db.execute(sql`select pg_notify(${channel}, ${tagged})`);
    await echoed;
  } finally {
    unsubscribe();
  }
}

/** The payload as sent, without the tag `publish(…, { echo: true })` adds. */
export function payloadOf(received: string): string {
  const index = received.lastIndexOf("#");
  return index >= 0 && received.length - index === 37 ? received.slice(0, index) : received;
}

/** Stops listening (a process shutting down). */
export async function stopListening() {
  hub.stopped = true;
  const client = hub.client;
  hub.client = null;
  hub.connection = null;
  setListening(false);
  await client?.end().catch(() => undefined);
}
