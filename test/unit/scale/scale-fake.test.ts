import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createScaleFake, portFromEnv, type ScaleFake } from '../../../fakes/scale/app';
import { SimulatedBalance } from '../../../fakes/scale/balance';
import { parseScaleLine } from '@/features/scale/scale';
import { pumpLines } from '@/features/scale/stream';

describe('the simulated balance writes lines Cupel reads back', () => {
  it('moves for settleMs after a new load, then settles, in each layout', () => {
    const b = new SimulatedBalance();
    for (const layout of ['coded', 'reply', 'plain'] as const) {
      b.set({ value: '12.345', unit: 'g', layout, settleMs: 500 }, 1_000);
      const moving = parseScaleLine(b.line(1_200));
      expect(moving, layout).toMatchObject({ kind: 'weight', layout, stable: false, unit: 'g' });
      expect((moving as { value: string }).value).not.toBe('12.345');
      expect(parseScaleLine(b.line(1_600)), layout).toMatchObject({ kind: 'weight', layout, stable: true, value: '12.345', unit: 'g' });
    }
  });

  it('never settles while in motion, and prints over and under range', () => {
    const b = new SimulatedBalance();
    b.set({ value: '5.20', unit: 'dwt', layout: 'plain', motion: true, settleMs: 0 }, 0);
    expect(parseScaleLine(b.line(60_000))).toMatchObject({ kind: 'weight', stable: false, unit: 'dwt' });
    for (const layout of ['coded', 'reply', 'plain'] as const) {
      b.set({ layout, load: 'overload', motion: false });
      expect(parseScaleLine(b.line())?.kind, layout).toBe('overload');
      b.set({ layout, load: 'underload' });
      expect(parseScaleLine(b.line())?.kind, layout).toBe('underload');
    }
  });

  it('refuses a malformed load', () => {
    const b = new SimulatedBalance();
    expect(() => b.set({ value: '12,5' })).toThrow(/decimal/);
    expect(() => b.set({ layout: 'fancy' as never })).toThrow(/layout/);
    expect(() => b.set({ raw: 'two\r\nlines' })).toThrow(/one line/);
  });
});

describe('the simulated scale over HTTP', () => {
  let fake: ScaleFake;
  beforeAll(async () => {
    fake = await createScaleFake({ port: 0, intervalMs: 20 });
  });
  afterAll(() => fake.close());
  beforeEach(() => fake.balance.set({ value: '0.000', unit: 'g', layout: 'coded', motion: false, load: 'in-range', raw: null, settleMs: 0 }));

  async function linesFor(ms: number): Promise<string[]> {
    const res = await fetch(`${fake.url}/stream`);
    expect(res.headers.get('access-control-allow-origin')).toBe('*');
    const seen: string[] = [];
    const pump = pumpLines(res.body!, (l) => seen.push(l));
    await new Promise((r) => setTimeout(r, ms));
    await pump.stop();
    return seen;
  }

  it('streams the load put on the pan with PUT /pan, a line at a time', async () => {
    const put = await fetch(`${fake.url}/pan`, { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ value: '7.90', unit: 'dwt', layout: 'reply', settleMs: 0 }) });
    expect(put.status).toBe(200);
    expect(await put.json()).toMatchObject({ value: '7.90', unit: 'dwt', layout: 'reply', settling: false });
    const lines = await linesFor(150);
    expect(lines.length).toBeGreaterThanOrEqual(3);
    for (const l of lines) expect(parseScaleLine(l)).toMatchObject({ kind: 'weight', layout: 'reply', stable: true, value: '7.90', unit: 'dwt' });
  });

  it('streams a raw line exactly as set', async () => {
    await fetch(`${fake.url}/pan`, { method: 'PUT', body: JSON.stringify({ raw: 'Date 2026-03-01' }) });
    expect((await linesFor(80))[0]).toBe('Date 2026-03-01');
  });

  it('answers 400 naming the problem for a bad load, and 404 elsewhere', async () => {
    const bad = await fetch(`${fake.url}/pan`, { method: 'PUT', body: JSON.stringify({ value: '-1' }) });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: string }).error).toMatch(/value/);
    expect((await fetch(`${fake.url}/nothing`)).status).toBe(404);
  });

  it('listens on loopback only, on the port from FAKE_SCALE_PORT', () => {
    expect(fake.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    expect(portFromEnv({ FAKE_SCALE_PORT: '12999' })).toBe(12999);
    expect(portFromEnv({})).toBe(12112);
    expect(() => portFromEnv({ FAKE_SCALE_PORT: 'x' })).toThrow(/FAKE_SCALE_PORT/);
  });
});
