// PLACEHOLDER until the PostgreSQL branch (i15-pg) is merged: it replaces this whole file with the real store.
import type { Store } from "../ports.js";

export interface PostgresStoreOptions {
  url: string;
  poolSize: number;
  statementTimeoutMs: number;
  sslMode: "disable" | "require" | "verify-full";
  now?: () => Date;
}

export function openPostgresStore(_options: PostgresStoreOptions): Promise<Store> {
  return Promise.reject(new Error("PostgreSQL support is not built in this branch"));
}
