import { describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { parseArgs } from '../../demo-data/generate.ts';
import { generateDemoShop } from '../../demo-data/generator/index.ts';

describe('generateDemoShop options', () => {
  it('rejects too few items and names the field', async () => {
    const run = generateDemoShop({ items: 10, outDir: '/nonexistent/never-written' });
    await expect(run).rejects.toBeInstanceOf(InputError);
    await expect(run).rejects.toThrow(/items must be a whole number from 40/);
  });

  it('rejects a fractional seed and a negative signal count', async () => {
    await expect(generateDemoShop({ seed: 1.5, outDir: '/nonexistent' })).rejects.toThrow(/seed must be a whole number/);
    await expect(generateDemoShop({ signals: -3, outDir: '/nonexistent' })).rejects.toThrow(/signals must be/);
  });
});

describe('demo-data/generate.ts parseArgs', () => {
  it('reads --seed, --out and the sizes', () => {
    const o = parseArgs(['--seed', '42', '--out', '/tmp/x', '--items', '500', '--customers', '900', '--signals', '7000']);
    expect(o).toEqual({ outDir: '/tmp/x', seed: 42, items: 500, customers: 900, signals: 7000 });
  });

  it('defaults the output to demo-data/out', () => {
    expect(parseArgs([]).outDir).toMatch(/demo-data[/\\]out$/);
  });

  it('rejects unknown flags, missing values and non-numbers', () => {
    expect(() => parseArgs(['--colour', 'green'])).toThrow(/unknown option '--colour'/);
    expect(() => parseArgs(['--seed'])).toThrow(InputError);
    expect(() => parseArgs(['--seed', 'seven'])).toThrow(/--seed needs a whole number, got 'seven'/);
  });
});
