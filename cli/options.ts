import { z } from 'zod';

/** Options every command that talks to the API shares. */
export const apiOptionsSchema = z.object({
  apiUrl: z.url({ protocol: /^https?$/, error: 'must be an http(s) URL' }),
  json: z.boolean().default(false),
});

export const DEFAULT_API_URL = 'http://localhost:3000';
