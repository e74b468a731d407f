import { describe, expect, it } from 'vitest';
import { RulesInputError } from '../validation/rules-input-error.js';
import { b3610mPipeSizes, b3619mPipeSizes, pipeSchedules, pipeStandardOf } from './b36-10m.js';
import { normalizeNps, pipeDimensions } from './pipe-dimensions.js';

const inch = (value: number) => ({ value, unit: 'in' });

describe('pipeDimensions', () => {
  it.each([
    ['2', '40', 2.375, 0.154],
    ['2', '80', 2.375, 0.218],
    ['2', 'XXS', 2.375, 0.436],
    ['6', '40', 6.625, 0.28],
    ['6', '80', 6.625, 0.432],
    ['6', '120', 6.625, 0.562],
  ])('ASME B36.10M: NPS %s Sch %s is %d in OD, %d in wall', (nps, sch, od, wall) => {
    expect(pipeDimensions(nps, sch)).toEqual({ outsideDiameter: inch(od), wall: inch(wall) });
  });

  it.each([
    ['1/2', '40', 0.84, 0.109],
    ['1/2', 'XXS', 0.84, 0.294],
    ['3/4', '80', 1.05, 0.154],
    ['1', '160', 1.315, 0.25],
    ['1-1/4', '40', 1.66, 0.14],
    ['1-1/2', '80', 1.9, 0.2],
    ['2-1/2', '40', 2.875, 0.203],
    ['3', '40', 3.5, 0.216],
    ['3-1/2', 'XS', 4.0, 0.318],
    ['4', '120', 4.5, 0.438],
    ['5', '160', 5.563, 0.625],
    ['8', '80', 8.625, 0.5],
    ['8', 'XXS', 8.625, 0.875],
    ['10', 'XS', 10.75, 0.5],
    ['10', '80', 10.75, 0.594],
    ['12', 'STD', 12.75, 0.375],
    ['12', '40', 12.75, 0.406],
    ['14', '40', 14.0, 0.438],
    ['16', '160', 16.0, 1.594],
    ['18', '80', 18.0, 0.938],
    ['20', '40', 20.0, 0.594],
    ['22', '80', 22.0, 1.125],
    ['24', '40', 24.0, 0.688],
    ['24', '160', 24.0, 2.344],
  ])('from memory: ASME B36.10M — NPS %s Sch %s is %d in OD, %d in wall', (nps, sch, od, wall) => {
    expect(pipeDimensions(nps, sch)).toEqual({ outsideDiameter: inch(od), wall: inch(wall) });
  });

  it('from memory: ASME B36.10M — STD equals Sch 40 through NPS 10 and XS equals Sch 80 through NPS 8', () => {
    for (const row of b3610mPipeSizes) {
      const n = Number(normalizeNps(row.nps)?.split('-')[0]);
      if (n <= 10 && row.walls['40'] !== undefined) expect(row.walls.STD).toBe(row.walls['40']);
      if (n <= 8) expect(row.walls.XS).toBe(row.walls['80']);
      if (n >= 12) expect([row.walls.STD, row.walls.XS]).toEqual([0.375, 0.5]);
    }
  });

  it('from memory: ASME B36.10M — numbered schedules get thicker and every wall is less than half the OD', () => {
    let lastOd = 0;
    for (const row of b3610mPipeSizes) {
      expect(row.od).toBeGreaterThan(lastOd);
      lastOd = row.od;
      const numbered = (['10', '20', '30', '40', '60', '80', '100', '120', '140', '160'] as const)
        .map((s) => row.walls[s])
        .filter((w) => w !== undefined);
      expect([...numbered].sort((a, b) => a - b)).toEqual(numbered);
      for (const s of pipeSchedules)
        if (row.walls[s] !== undefined) expect(row.walls[s]).toBeLessThan(row.od / 2);
    }
  });

  it('covers NPS 1/2 through 48 with every listed size', () => {
    expect(b3610mPipeSizes.map((r) => r.nps)).toEqual(
      [
        '1/2',
        '3/4',
        '1',
        '1-1/4',
        '1-1/2',
        '2',
        '2-1/2',
        '3',
        '3-1/2',
        '4',
        '5',
        '6',
        '8',
        '10',
        '12',
      ].concat([
        '14',
        '16',
        '18',
        '20',
        '22',
        '24',
        '26',
        '28',
        '30',
        '32',
        '34',
        '36',
        '38',
        '40',
        '42',
        '44',
        '46',
        '48',
      ]),
    );
  });

  it.each([
    ['8', '20', 8.625, 0.25],
    ['8', '30', 8.625, 0.277],
    ['8', '60', 8.625, 0.406],
    ['8', '100', 8.625, 0.594],
    ['8', '140', 8.625, 0.812],
    ['12', '30', 12.75, 0.33],
    ['14', '10', 14.0, 0.25],
    ['16', '60', 16.0, 0.656],
    ['20', '100', 20.0, 1.281],
    ['24', '140', 24.0, 2.062],
    ['2', '10', 2.375, 0.109],
    ['30', '10', 30.0, 0.312],
    ['36', '20', 36.0, 0.5],
    ['48', 'STD', 48.0, 0.375],
    ['48', 'XS', 48.0, 0.5],
  ])('from memory: ASME B36.10M table 1 — NPS %s Sch %s is %d in OD, %d in wall', (nps, sch, od, wall) => {
    expect(pipeDimensions(nps, sch)).toEqual({ outsideDiameter: inch(od), wall: inch(wall) });
  });

  it.each([
    ['1/2', '5S', 0.84, 0.065],
    ['2', '10S', 2.375, 0.109],
    ['4', '5S', 4.5, 0.083],
    ['6', '40S', 6.625, 0.28],
    ['6', '80S', 6.625, 0.432],
    ['12', '80S', 12.75, 0.5],
    ['14', '10S', 14.0, 0.188],
    ['30', '10S', 30.0, 0.312],
  ])('from memory: ASME B36.19M table 1 — NPS %s Sch %s is %d in OD, %d in wall', (nps, sch, od, wall) => {
    expect(pipeDimensions(nps, sch)).toEqual({ outsideDiameter: inch(od), wall: inch(wall) });
  });

  it('from memory: ASME B36.19M — 5S < 10S < 40S < 80S; 40S is the STD wall and 80S the XS wall of B36.10M; same OD', () => {
    for (const row of b3619mPipeSizes) {
      const carbon = b3610mPipeSizes.find((r) => r.nps === row.nps);
      expect(carbon?.od, row.nps).toBe(row.od);
      const walls = (['5S', '10S', '40S', '80S'] as const)
        .map((s) => row.walls[s])
        .filter((w) => w !== undefined);
      expect([...walls].sort((a, b) => a - b)).toEqual(walls);
      if (row.walls['40S'] !== undefined) expect(row.walls['40S']).toBe(carbon?.walls.STD);
      if (row.walls['80S'] !== undefined) expect(row.walls['80S']).toBe(carbon?.walls.XS);
    }
  });

  it('names the standard of a schedule', () => {
    expect(pipeStandardOf('10S')).toBe('ASME B36.19M');
    expect(pipeStandardOf('10')).toBe('ASME B36.10M');
    expect(pipeStandardOf('XS')).toBe('ASME B36.10M');
    expect(pipeStandardOf('XXS')).toBe('ASME B36.10M');
  });

  it('accepts the ways sizes and schedules are written', () => {
    expect(pipeDimensions('1 1/4', 'sch 80')).toEqual(pipeDimensions('1-1/4', '80'));
    expect(pipeDimensions('1.25', 'Sch80')).toEqual(pipeDimensions('1-1/4', '80'));
    expect(pipeDimensions('NPS 2', 'std')).toEqual(pipeDimensions('2', 'STD'));
    expect(pipeDimensions('0.5', 'xxs')).toEqual(pipeDimensions('1/2', 'XXS'));
    expect(pipeDimensions('2', '10s')).toEqual(pipeDimensions('2', '10S'));
    expect(pipeDimensions('2', 'Sch 10 S')).toEqual(pipeDimensions('2', '10S'));
  });

  it.each([
    ['7', '40', 'nps'],
    ['50', '40', 'nps'],
    ['26', '40', 'schedule'],
    ['14', '40S', 'schedule'],
    ['26', '10S', 'schedule'],
    ['1/4', '40', 'nps'],
    ['', '40', 'nps'],
    ['2', '60', 'schedule'],
    ['2', 'X', 'schedule'],
    ['2', '120', 'schedule'],
    ['3-1/2', '160', 'schedule'],
    ['14', 'XXS', 'schedule'],
    ['22', '40', 'schedule'],
  ])('from memory: ASME B36.10M — NPS %j Sch %j does not exist: RangeError on %s', (nps, sch, field) => {
    expect(() => pipeDimensions(nps, sch)).toThrow(RangeError);
    try {
      pipeDimensions(nps, sch);
    } catch (e) {
      expect(e).toBeInstanceOf(RulesInputError);
      expect(Object.keys((e as RulesInputError).fields)).toEqual([field]);
    }
  });

  it('says which schedules a size has when one is missing', () => {
    expect(() => pipeDimensions('2', '120')).toThrow(
      /ASME B36.10M defines no schedule 120 for NPS 2 that Beadroll lists \(it has 10, 40, STD, 80, XS, 160, XXS\)/,
    );
  });
});
