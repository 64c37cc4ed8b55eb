import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { describe, expect, it } from 'vitest';

import { TrafficChart } from './traffic-chart.js';

describe('TrafficChart', () => {
  async function render(labels: string[], series: Array<{ label: string; data: number[] }>) {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
    const fixture = TestBed.createComponent(TrafficChart);
    fixture.componentRef.setInput('labels', labels);
    fixture.componentRef.setInput('series', series);
    await fixture.whenStable();
    return fixture;
  }

  it('stacks one dataset per key on days shown without the year', async () => {
    const fixture = await render(['2026-12-01', '2026-12-02'], [{ label: 'Checkout', data: [3, 4] }, { label: 'Other calls', data: [1, 0] }]);
    const data = (fixture.componentInstance as unknown as { data(): { labels: string[]; datasets: Array<{ label: string; data: number[]; stack: string }> } }).data();
    expect(data.labels).toEqual(['12-01', '12-02']);
    expect(data.datasets.map((d) => [d.label, d.data, d.stack])).toEqual([
      ['Checkout', [3, 4], 'calls'],
      ['Other calls', [1, 0], 'calls'],
    ]);
  });

  it('tells a screen reader what the chart holds', async () => {
    const fixture = await render(['2026-12-01', '2026-12-02'], [{ label: 'Checkout', data: [3, 4] }]);
    const canvas = (fixture.nativeElement as HTMLElement).querySelector('canvas')!;
    expect(canvas.getAttribute('role')).toBe('img');
    expect(canvas.getAttribute('aria-label')).toContain('2 days, 7 calls in all, 1 series');
  });
});
