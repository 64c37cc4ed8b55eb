import { describe, expect, it } from 'vitest';
import { wiringScheduleCsv } from '../../../api/exports/wiring-schedule.js';
import { block, readBlocks, readCsv, run } from './estimates.js';

const context = { estimateId: 'est_4kq7', createdAt: '2026-12-01T09:30:00Z', clientName: 'Kestrel & Finch Builders', stairName: 'House 12' };

describe('the wiring schedule CSV', () => {
  const result = run('alderRowTownhouse');
  const text = wiringScheduleCsv(result, context);
  const blocks = readBlocks(text);

  it('is a spreadsheet-readable CSV: byte-order mark, CRLF, one width for every row', () => {
    expect(text.startsWith('\uFEFF')).toBe(true);
    expect(text.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    expect(() => readCsv(text)).not.toThrow(); // relax_column_count is off: every row has the same width
  });

  it('lays out blocks of a title, a header with units and rows, separated by empty rows', () => {
    expect(blocks.map((b) => b.title)).toEqual(['Estimate', 'Treads', 'Controllers', 'Circuits', 'Feeders', 'Sensor cable', 'Cable to order']);
    expect(block(blocks, 'Treads').header).toEqual([
      'tread',
      'flight',
      'controller',
      'output',
      'strip length (mm)',
      'power (W)',
      'current (A)',
      'cable',
      'lead length (m)',
      'conductor (mm²)',
      'conductor (AWG)',
      'drop (%)',
      'drop from driver (%)',
    ]);
    const estimateRows = Object.fromEntries(block(blocks, 'Estimate').rows.map((r) => [r.field, r.value]));
    expect(estimateRows).toMatchObject({ client: 'Kestrel & Finch Builders', stair: 'House 12', estimate: 'est_4kq7', 'run at': '2026-12-01T09:30:00.000Z', 'engine version': result.engineVersion, layout: 'tread-strips' });
  });

  it('has one row per tread with the engine’s figures, and a few checked by hand', () => {
    const treads = block(blocks, 'Treads').rows;
    expect(treads).toHaveLength(14);
    treads.forEach((row, i) => {
      const t = result.treads[i];
      expect(row).toMatchObject({
        tread: String(t.index),
        flight: '1', // one straight flight: its sensors name flight 1 only
        controller: String(t.controller),
        output: String(t.output),
        'strip length (mm)': String(t.stripLengthMm),
        'power (W)': String(t.powerW),
        'lead length (m)': String(t.cableLengthM),
        'conductor (mm²)': String(t.crossSectionMm2),
        'drop (%)': String(t.dropPercent),
        'drop from driver (%)': String(t.pathDropPercent),
      });
    });
    // By hand: 900 mm tread − 2 × 20 mm clearance = 860 mm, cut at 50 mm marks → 850 mm;
    // 0.85 m × 10 W/m = 8.5 W; 8.5 W / 24 V = 0.3542 A.
    expect(treads[0]).toMatchObject({ 'strip length (mm)': '850', 'power (W)': '8.5', 'current (A)': '0.3542', cable: 'tread-lead' });
    // By hand: the controller sits at tread 7, so tread 7's lead is the 0.5 m service allowance alone.
    expect(treads[6]['lead length (m)']).toBe('0.5');
  });

  it('lists the circuit with its driver and protection, the feeder and the sensor cable', () => {
    const [circuit] = block(blocks, 'Circuits').rows;
    // By hand: 14 treads × 8.5 W = 119 W; 119 W / 0.8 loading = 148.75 W → the 150 W rating; 119 / 150 = 79.33 %.
    expect(circuit).toMatchObject({ circuit: '1', 'load (W)': '119', 'driver rating (W)': '150', 'loading (%)': String(result.circuits[0].driver!.loadingPercent), 'protected by': 'driver current limit' });
    expect(Number(circuit['loading (%)'])).toBeCloseTo((119 / 150) * 100, 3);
    const [feeder] = block(blocks, 'Feeders').rows;
    expect(feeder).toMatchObject({ to: 'controller', controller: '1', 'length (m)': '2', 'conductor (mm²)': '1', 'fuse (A)': '6.3' });
    const sensors = block(blocks, 'Sensor cable').rows;
    expect(sensors.map((s) => s.sensor)).toEqual(['foot', 'head', 'total']);
    // The total is the sum of the two runs: 2.366 m + 2.677 m = 5.043 m.
    expect(sensors[2]['cable length (m)']).toBe('5.043');
    expect(block(blocks, 'Cable to order').rows.map((c) => [c.use, c['order length (m)']])).toEqual(result.cables.map((c) => [c.use, String(c.orderLengthM)]));
  });

  it('names each tread’s flight from the context and lists the lit landings', () => {
    const corner = run('alderRowCornerUnit', { staircase: { treads: 15, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250, flights: [{ treads: 7, landingLengthMm: 900 }, { treads: 8 }], litLandings: [1] } });
    const withFlights = readBlocks(wiringScheduleCsv(corner, { treadsPerFlight: [7, 8] }));
    const flights = block(withFlights, 'Treads').rows.map((r) => r.flight);
    expect(flights).toEqual([...Array(7).fill('1'), ...Array(8).fill('2')]);
    const [landing] = block(withFlights, 'Lit landings').rows;
    expect(landing).toMatchObject({ landing: '1', 'below tread': '7', 'strip length (mm)': String(corner.landings![0].stripLengthMm), output: String(corner.landings![0].output) });
    // Without the flights the answer cannot tell where flight 1 ends: the column stays empty.
    expect(block(readBlocks(wiringScheduleCsv(corner)), 'Treads').rows.every((r) => r.flight === '')).toBe(true);
  });

  it('writes the pixel run, its data outputs and every data gap for a corridor, and no tread block', () => {
    const corridor = run('quaysideCorridor');
    const parsed = readBlocks(wiringScheduleCsv(corridor));
    expect(parsed.map((b) => b.title)).not.toContain('Treads');
    const [rail] = block(parsed, 'Pixel runs').rows;
    // By hand: 18 m × 60 pixels/m = 1080 pixels.
    expect(rail).toMatchObject({ run: 'rail', pixels: '1080', 'length (m)': '18', protocol: 'one-wire-800k' });
    const gaps = block(parsed, 'Data runs').rows;
    expect(gaps.map((g) => [g.output, g['length (m)'], g['within limit']])).toEqual(corridor.pixels.rail!.dataGaps.map((g) => [String(g.output), String(g.lengthM), String(g.withinLimit)]));
    expect(gaps.some((g) => g['within limit'] === 'false')).toBe(true);
    expect(block(parsed, 'Feeders').rows.map((f) => f['feed point'])).toEqual(corridor.feeder.runs.map((f) => String(f.feedPoint)));
  });

  it('adds a pixels column for pixel segments on the treads', () => {
    const pixels = run('alderRowTreadPixels');
    const treads = block(readBlocks(wiringScheduleCsv(pixels)), 'Treads');
    expect(treads.header).toContain('pixels');
    // By hand: 850 mm at 20 pixels/m = 17 pixels per tread.
    expect(treads.rows.map((r) => r.pixels)).toEqual(Array(14).fill('17'));
    expect(treads.rows[1].cable).toBe('chain-link');
  });
});
