import { eq } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Db } from '../db/client.js';
import { embedScripts } from '../db/schema.js';
import type { EmbedBundle } from './bundle.js';

/** Old versions are asked for rarely but, once a shop pins one, on every page view: keep a few in memory. */
const KEPT_IN_MEMORY = 8;

/**
 * The estimator scripts of earlier releases. A versioned URL is promised immutable for a year, so
 * each release's script is stored in the database the first time an instance serves it, and an
 * instance of a later release still answers the old URL byte for byte.
 */
export function createEmbedScriptArchive({ db, logger }: { db: Db; logger: Logger }) {
  const recent = new Map<string, Promise<Buffer | undefined>>();

  const load = async (version: string): Promise<Buffer | undefined> => {
    const [row] = await db.select({ script: embedScripts.script }).from(embedScripts).where(eq(embedScripts.version, version));
    return row ? Buffer.from(row.script, 'utf8') : undefined;
  };

  return {
    /** Stores this release's script (once per version, whichever instance starts first). */
    async remember(bundle: EmbedBundle): Promise<void> {
      const { version, integrity } = bundle.manifest;
      try {
        await db.insert(embedScripts).values({ version, integrity, script: bundle.script.toString('utf8') }).onConflictDoNothing();
      } catch (err) {
        // Not fatal: the current version is served from disk; only later releases would miss it.
        logger.warn({ err: { message: (err as Error).message }, version }, 'estimator script not archived');
      }
    },

    /** An earlier release's script, or undefined when this deployment never served that version. */
    find(version: string): Promise<Buffer | undefined> {
      const hit = recent.get(version);
      if (hit) return hit;
      const found = load(version);
      // Unknown versions are not cached: they cost one indexed read, and caching them would let anyone fill the map.
      void found.then(
        (script) => {
          if (!script) return;
          if (recent.size >= KEPT_IN_MEMORY) recent.delete(recent.keys().next().value!);
          recent.set(version, found);
        },
        () => undefined,
      );
      return found;
    },
  };
}

export type EmbedScriptArchive = ReturnType<typeof createEmbedScriptArchive>;
