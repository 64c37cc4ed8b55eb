import { describe, expect, it } from 'vitest';

import { MAX_JOB_NAME_LENGTH, TERMINAL_BATCH_STATUSES } from '../../../../shared/schemas/batch-jobs.js';
import { FINAL_STATUSES, JOB_NAME_MAX, formatEta, formatRate, isFinal, jobLabel, statusText } from './batch-status.js';

describe('batch status', () => {
  it('knows the same final statuses and name bound as the API', () => {
    expect([...FINAL_STATUSES].sort()).toEqual([...TERMINAL_BATCH_STATUSES].sort());
    expect(JOB_NAME_MAX).toBe(MAX_JOB_NAME_LENGTH);
    expect(isFinal('running')).toBe(false);
    expect(isFinal('queued')).toBe(false);
    expect(isFinal('cancelled')).toBe(true);
  });

  it('says why a job stopped', () => {
    expect(statusText({ status: 'stopped', stopReason: 'quota_exceeded' })).toBe('Stopped: quota used up');
    expect(statusText({ status: 'succeeded', stopReason: null })).toBe('Finished');
  });

  it('names a job without a name by the start of its id', () => {
    expect(jobLabel({ id: '3d1f7c2a-9b4e-4f60-8a2d-5c7e1b9f0a34', name: null })).toBe('Job 3d1f7c2a');
    expect(jobLabel({ id: '3d1f7c2a-9b4e-4f60-8a2d-5c7e1b9f0a34', name: 'Alder Row, plots 1-24' })).toBe('Alder Row, plots 1-24');
  });

  it('writes the time left in hours, minutes and seconds', () => {
    expect(formatEta(null)).toBe('—');
    expect(formatEta(44.6)).toBe('45 s');
    expect(formatEta(200)).toBe('3 min 20 s');
    expect(formatEta(180)).toBe('3 min');
    expect(formatEta(3840)).toBe('1 h 4 min');
    expect(formatEta(7200)).toBe('2 h');
  });

  it('writes the rate with one decimal below ten rows a second', () => {
    expect(formatRate(null)).toBe('—');
    expect(formatRate(0.44)).toBe('0.4 rows/s');
    expect(formatRate(1250.4)).toBe('1,250 rows/s');
  });
});
