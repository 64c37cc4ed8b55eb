import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { sql } from 'drizzle-orm';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import pg from 'pg';
import * as schema from './schema.js';

/** One Drizzle type for both drivers, so no code path exists for only one of them. */
export type Db = PgDatabase<PgQueryResultHKT, typeof schema>;

export interface Database {
  db: Db;
  kind: 'pglite' | 'postgres';
  /** Schema the tables live in (a per-worker schema in tests against a real server). */
  schemaName: string;
  /** Runs `fn` while holding a database-wide advisory lock (migrations, seeding). */
  withLock<T>(key: number, fn: (db: Db) => Promise<T>): Promise<T>;
  ping(): Promise<void>;
  /**
   * LISTEN on a channel (PostgreSQL NOTIFY on both drivers), so every instance on this database
   * hears of changes made by another — e.g. a revoked key. Stops when the database closes.
   */
  subscribe(channel: string, onMessage: (payload: string) => void): Promise<void>;
  publish(channel: string, payload: string): Promise<void>;
  close(): Promise<void>;
}

const CHANNEL = /^[a-z_][a-z0-9_]{0,62}$/;
function checkChannel(channel: string): string {
  if (!CHANNEL.test(channel)) throw new Error(`Invalid channel name: ${channel}`);
  return channel;
}

export interface DatabaseOptions {
  /** postgres:// URL; without it the embedded PGlite is used. */
  url?: string;
  /** PGlite data directory; `memory://` (or undefined with no url) keeps it in memory. */
  dataDir?: string;
  /** Real PostgreSQL only: put every table in this schema (created if missing). */
  schemaName?: string;
}

const SCHEMA_NAME = /^[a-z_][a-z0-9_]{0,62}$/;

export async function openDatabase(options: DatabaseOptions): Promise<Database> {
  return options.url ? openPostgres(options.url, options.schemaName) : openPglite(options.dataDir);
}

async function openPglite(dataDir = 'memory://'): Promise<Database> {
  const inMemory = dataDir.startsWith('memory://');
  // PGlite's own mkdir is not recursive: create the parent first.
  if (!inMemory) mkdirSync(path.dirname(path.resolve(dataDir)), { recursive: true });
  const client = new PGlite(inMemory ? undefined : dataDir);
  await client.waitReady;
  const db = drizzlePglite(client, { schema }) as unknown as Db;
  return {
    db,
    kind: 'pglite',
    schemaName: 'public',
    // PGlite is single-connection and single-process: nothing else can race us.
    withLock: (_key, fn) => fn(db),
    ping: async () => {
      await client.query('select 1');
    },
    subscribe: async (channel, onMessage) => {
      await client.listen(checkChannel(channel), onMessage);
    },
    publish: async (channel, payload) => {
      await client.query('select pg_notify($1, $2)', [checkChannel(channel), payload]);
    },
    close: () => client.close(),
  };
}

async function openPostgres(url: string, schemaName?: string): Promise<Database> {
  if (schemaName !== undefined && !SCHEMA_NAME.test(schemaName)) {
    throw new Error(`Invalid schema name: ${schemaName}`);
  }
  const pool = new pg.Pool({
    connectionString: url,
    max: 10,
    ...(schemaName ? { options: `-c search_path=${schemaName}` } : {}),
  });
  if (schemaName) await pool.query(`create schema if not exists "${schemaName}"`);
  const db = drizzlePg(pool, { schema }) as unknown as Db;
  const listeners: pg.Client[] = [];
  return {
    db,
    kind: 'postgres',
    schemaName: schemaName ?? 'public',
    withLock: async (key, fn) => {
      // Several API instances may start together against one server: serialise migrations.
      const conn = await pool.connect();
      try {
        await conn.query('select pg_advisory_lock($1)', [key]);
        return await fn(drizzlePg(conn, { schema }) as unknown as Db);
      } finally {
        await conn.query('select pg_advisory_unlock($1)', [key]).catch(() => undefined);
        conn.release();
      }
    },
    ping: async () => {
      await db.execute(sql`select 1`);
    },
    subscribe: async (channel, onMessage) => {
      // LISTEN needs a connection of its own that stays open.
      const listener = new pg.Client({ connectionString: url });
      listener.on('notification', (n) => {
        if (n.channel === channel && n.payload !== undefined) onMessage(n.payload);
      });
      listener.on('error', () => undefined); // a lost listener only delays cache expiry to its TTL
      await listener.connect();
      await listener.query(`listen "${checkChannel(channel)}"`);
      listeners.push(listener);
    },
    publish: async (channel, payload) => {
      await pool.query('select pg_notify($1, $2)', [checkChannel(channel), payload]);
    },
    close: async () => {
      await Promise.all(listeners.splice(0).map((l) => l.end().catch(() => undefined)));
      await pool.end();
    },
  };
}
