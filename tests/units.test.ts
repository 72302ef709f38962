import { describe, expect, it } from 'vitest';
import { SPEED_OF_LIGHT } from '../src/physics';
import {
  parseAngle,
  parseBandwidth,
  parseFrequency,
  parseGap,
  parseLength,
  parseNumber,
  parseNumberList,
  parsePrice,
  parseTime,
  parseWavelength,
} from '../src/plan/units';

describe('units: quantities as typed in a project table', () => {
  it('lengths, with a default unit for bare numbers (SI definitions of the prefixes)', () => {
    expect(parseLength('cell', '20 nm')).toBe(2e-8);
    expect(parseLength('cell', '0.02 um')).toBe(2e-8);
    expect(parseLength('cell', '0.02 µm')).toBe(2e-8);
    expect(parseLength('cell', 20)).toBe(2e-8); // default nm
    expect(parseLength('cell', '1 mm', 'nm')).toBe(1e-3);
    expect(parseLength('cell', '1', 'm')).toBe(1);
  });

  it('wavelength from a length or a frequency, λ = c/f (definition)', () => {
    expect(parseWavelength('band_short', '1550 nm')).toBe(1.55e-6);
    expect(parseWavelength('band_short', '1.55 um')).toBe(1.55e-6);
    // c/1550 nm = 193.414489032… THz; 12 significant digits of it give back exactly 1550 nm.
    expect(parseWavelength('band_short', '193.414489032 THz')).toBe(1.55e-6);
    expect(parseWavelength('band_short', '30 GHz')).toBe(Number((SPEED_OF_LIGHT / 30e9).toPrecision(12)));
    expect(parseWavelength('band_short', '9.99308193333 mm')).toBe(parseWavelength('band_short', '30 GHz'));
  });

  it('times, frequencies, angles, data rates', () => {
    expect(parseTime('duration', '2.5 h')).toBe(9000);
    expect(parseTime('duration', '500 fs')).toBe(5e-13);
    expect(parseTime('duration', 500)).toBe(5e-13); // default fs
    expect(parseFrequency('ring_frequency', '194 THz')).toBe(1.94e14);
    expect(parseAngle('angle_max', '30 deg')).toBe(30);
    expect(parseAngle('angle_max', 30)).toBe(30);
    expect(parseAngle('angle_max', '0.5 rad')).toBe(Number(((0.5 * 180) / Math.PI).toPrecision(12)));
    expect(parseBandwidth('bandwidth', '10 GB/s')).toBe(1e10);
    expect(parseBandwidth('bandwidth', 12.5)).toBe(1.25e10); // default GB/s
  });

  it('plain numbers, percentages, prices, gaps and lists', () => {
    expect(parseNumber('intensity_error', '1%')).toBe(0.01);
    expect(parseNumber('intensity_error', '0.01')).toBe(0.01);
    expect(parsePrice('price_per_hour', '$3/h')).toBe(3);
    expect(parsePrice('price_per_hour', '2.40 EUR/h')).toBe(2.4);
    expect(parsePrice('price_per_hour', '3 per hour')).toBe(3);
    expect(parsePrice('price_per_hour', 0.4)).toBe(0.4);
    expect(parseGap('gap', '5 cells')).toEqual({ cells: 5 });
    expect(parseGap('gap', 5)).toEqual({ cells: 5 });
    expect(parseGap('gap', '0.5 wavelengths')).toEqual({ wavelengths: 0.5 });
    expect(parseGap('gap', '1 λ')).toEqual({ wavelengths: 1 });
    expect(parseGap('gap', '300 nm')).toEqual({ metres: 3e-7 });
    expect(parseNumberList('orders', '2, 3 4')).toEqual([2, 3, 4]);
  });

  it('wrong dimensions give a specific error', () => {
    expect(() => parseWavelength('wavelength', '5 kg')).toThrow('wavelength must be a length or a frequency (got 5 kg)');
    expect(() => parseLength('cell', '3 THz')).toThrow('cell must be a length (got 3 THz)');
    expect(() => parseTime('duration', '3 nm')).toThrow('duration must be a time (got 3 nm)');
    expect(() => parseWavelength('band_short', '3 parsecs')).toThrow(/band_short must be a length or a frequency \(got "3 parsecs"/);
    expect(() => parseLength('cell', '-3 nm')).toThrow('cell must be greater than 0 (got -3 nm)');
    expect(() => parseNumber('coupling', 'half')).toThrow('coupling must be a plain number (got "half")');
    expect(() => parsePrice('price_per_hour', 'cheap')).toThrow(/price_per_hour must be a price per hour/);
    expect(() => parseGap('gap', '2 s')).toThrow(/gap must be a number of cells, of wavelengths/);
  });

  it('a repeated text is parsed once and gives the same value (cache)', () => {
    const a = parseWavelength('band_short', '1310 nm');
    const b = parseWavelength('band_short', '1310 nm');
    expect(Object.is(a, b)).toBe(true);
    expect(() => parseWavelength('band_long', 'x nm')).toThrow(/band_long/);
    expect(() => parseWavelength('band_short', 'x nm')).toThrow(/band_short/);
  });
});
