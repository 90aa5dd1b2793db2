import { interpolateCividis } from 'd3-scale-chromatic';
import { describe, expect, it } from 'vitest';
import { cividis, temperatureColour } from '../../../src/lib/ui/temperature-scale';

describe('temperature colours', () => {
  // Reference: d3-scale-chromatic 3.1's interpolateCividis (Nuñez, Anderton & Renslow 2018, PLOS ONE 13(7): e0199239).
  it('are cividis exactly as d3-scale-chromatic draws it, across the whole scale', () => {
    for (let i = 0; i <= 1000; i++) expect(cividis(i / 1000)).toBe(interpolateCividis(i / 1000));
    expect(cividis(-1)).toBe(interpolateCividis(0));
    expect(cividis(2)).toBe(interpolateCividis(1));
  });

  it('run from cold mains water (10 °C) to the hottest stored water (70 °C)', () => {
    expect(temperatureColour(10)).toBe(interpolateCividis(0));
    expect(temperatureColour(70)).toBe(interpolateCividis(1));
    expect(temperatureColour(40)).toBe(interpolateCividis(0.5));
  });
});
