import { z } from 'zod';

/** Largest page any list answers; small enough that one page never becomes a heavy answer. */
export const PAGE_LIMIT_MAX = 200;
export const PAGE_LIMIT_DEFAULT = 50;

/** `?limit=&cursor=`: cursor pagination shared by every list. */
export const pageQuerySchema = z.strictObject({
  limit: z.coerce.number().int().min(1).max(PAGE_LIMIT_MAX).default(PAGE_LIMIT_DEFAULT).meta({ description: `Items per page (1–${PAGE_LIMIT_MAX}, default ${PAGE_LIMIT_DEFAULT}).` }),
  cursor: z.string().max(200).optional().meta({ description: 'The `nextCursor` of the previous page.' }),
});
export type PageQuery = z.output<typeof pageQuerySchema>;

/** A page of a list: `{ items, nextCursor }`, with `nextCursor: null` on the last page. */
export function pageOf<T extends z.ZodType>(item: T, id: string) {
  return z
    .object({
      items: z.array(item),
      nextCursor: z.string().nullable().meta({ description: 'Pass as `cursor` for the next page; `null` on the last page.' }),
    })
    .meta({ id });
}
