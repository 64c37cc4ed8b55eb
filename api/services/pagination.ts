import { z } from 'zod';
import { HttpProblem } from '../problem.js';

export { pageQuerySchema, type PageQuery } from '../../shared/schemas/page.js';

export interface Page<T> {
  items: T[];
  nextCursor: string | null;
}

/** Opaque cursors: base64url JSON of the sort key of the last row served. */
export function encodeCursor(value: unknown): string {
  return Buffer.from(JSON.stringify(value)).toString('base64url');
}

export function decodeCursor<T>(cursor: string | undefined, schema: z.ZodType<T>): T | undefined {
  if (cursor === undefined) return undefined;
  try {
    return schema.parse(JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8')));
  } catch {
    throw new HttpProblem(400, 'invalid_cursor', 'Invalid cursor', 'The cursor is not one this API issued.', {
      errors: [{ path: 'cursor', message: 'not a valid cursor' }],
    });
  }
}

/** Rows fetched with limit + 1 tell whether there is more without a count query. */
export function toPage<R, T>(rows: R[], limit: number, view: (r: R) => T, cursorOf: (r: R) => unknown): Page<T> {
  const more = rows.length > limit;
  const pageRows = more ? rows.slice(0, limit) : rows;
  return {
    items: pageRows.map(view),
    nextCursor: more ? encodeCursor(cursorOf(pageRows[pageRows.length - 1])) : null,
  };
}
