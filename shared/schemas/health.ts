import { z } from 'zod';

export const healthSchema = z
  .object({
    status: z.literal('ok'),
    service: z.literal('treadwise-api'),
    version: z.string().meta({ description: 'Release of the API.' }),
    engineVersion: z.string().meta({ description: 'Semver of the sizing engine.' }),
    time: z.iso.datetime().meta({ description: 'Server time.' }),
  })
  .meta({
    id: 'Health',
    description: 'Liveness: the process is up and answering.',
    example: { status: 'ok', service: 'treadwise-api', version: '0.1.0', engineVersion: '1.0.0', time: '2026-12-01T09:30:00.000Z' },
  });

export const readinessSchema = z
  .object({
    status: z.literal('ready'),
    checks: z.object({ database: z.literal('ok') }),
  })
  .meta({
    id: 'Readiness',
    description: 'Readiness: the database answers.',
    example: { status: 'ready', checks: { database: 'ok' } },
  });

export type Health = z.infer<typeof healthSchema>;
export type Readiness = z.infer<typeof readinessSchema>;
