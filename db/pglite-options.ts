import { types, type PGliteOptions } from "@electric-sql/pglite";

/**
 * PGlite settings shared by the database thread and in-process PGlite. Binary parameters go to PostgreSQL as bytes:
 * by default PGlite turns a bytea parameter into hex text in JavaScript, which for a 5.6 MB pick set cost more than the
 * database's own work of storing it. With the identity serializer its protocol writer sends the bytes as a binary
 * parameter instead.
 */
export const pgliteOptions: PGliteOptions = {
  serializers: { [types.BYTEA]: ((value: Uint8Array | string) => value) as unknown as (value: unknown) => string },
};
