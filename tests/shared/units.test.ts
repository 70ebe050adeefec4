// Unit conversions from their definitions, and the text each unit system shows.
// Sources: NIST Handbook 44, Appendix C "General Tables of Units of Measurement" (inch, foot, US and
// imperial gallon); NIST SP 811 (2008), Appendix B.8 (psi, bar, conventional metre and inch of water);
// 3rd CGPM (1901) and NIST SP 330 for standard gravity. The rounded SP 811 factors quoted below are
// recalled from memory, not re-checked; the exact ones are built from the definitions they rest on.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  LENGTH_UNITS,
  PRESSURE_UNITS,
  TEMPERATURE_UNITS,
  VOLUME_UNITS,
  convert,
  displayUnits,
  formatLength,
  formatNumber,
  formatPressure,
  formatTemperature,
  formatVolume,
  fromSI,
  quantityOf,
  toSI,
  type Unit,
} from '@shared/units/index';

describe('toSI definitional factors', () => {
  it.each<[Unit, number, string]>([
    ['in', 25.4, 'inch = 25.4 mm exactly (NIST HB 44 App. C)'],
    ['ft', 304.8, 'foot = 12 in = 304.8 mm exactly (NIST HB 44 App. C)'],
    ['cm', 10, 'centimetre = 10 mm (SI prefix)'],
    ['m', 1000, 'metre = 1000 mm (SI prefix)'],
    ['usgal', 3.785411784, 'US gallon = 231 in³ = 3.785411784 L exactly (NIST HB 44 App. C)'],
    ['impgal', 4.54609, 'imperial gallon = 4.54609 L exactly (NIST HB 44 App. C)'],
    ['m3', 1000, 'cubic metre = 1000 L'],
    ['bar', 100, 'bar = 100 kPa exactly (NIST SP 811 App. B.8)'],
    ['mH2O', 9.80665, 'conventional metre of water = 9.80665 kPa (NIST SP 811 App. B.8)'],
    ['inH2O', 0.24908891, 'conventional inch of water = 0.0254 m × 9.80665 kPa/m = 0.24908891 kPa'],
    ['psi', 6.894757293168, 'psi = 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² = 6.894757293168 kPa'],
  ])('converts 1 %s to the stored unit: %s', (unit, expected) => {
    expect(toSI(1, unit)).toBeCloseTo(expected, 12);
  });

  it('agrees with the rounded NIST SP 811 Appendix B.8 factors (recalled from memory: psi 6.894 757 E+03 Pa, inch of water 2.490 889 E+02 Pa, US gallon 3.785 412 E-03 m³)', () => {
    expect(toSI(1, 'psi') * 1000).toBeCloseTo(6894.757, 3);
    expect(toSI(1, 'inH2O') * 1000).toBeCloseTo(249.0889, 4);
    expect(toSI(1, 'usgal') / 1000).toBeCloseTo(3.785412e-3, 9);
  });

  it('gives 0 °C for 32 °F, 100 °C for 212 °F and meets at −40 (definition of the Fahrenheit scale)', () => {
    expect(toSI(32, 'F')).toBe(0);
    expect(toSI(212, 'F')).toBe(100);
    expect(toSI(-40, 'F')).toBe(-40);
    expect(fromSI(37, 'F')).toBeCloseTo(98.6, 12);
  });
});

describe('convert', () => {
  it('matches the published cubic-metre conversions (spikevm.com, "Vertical Cylinder Tank - Metres", Conversions: 1 m³ = 264.172052358148 US gal = 219.969248299088 imperial gal)', () => {
    expect(convert(1, 'm3', 'usgal')).toBeCloseTo(264.172052358148, 9);
    expect(convert(1, 'm3', 'impgal')).toBeCloseTo(219.969248299088, 9);
  });

  it('converts within a quantity', () => {
    expect(convert(1, 'ft', 'in')).toBeCloseTo(12, 12);
    expect(convert(1, 'bar', 'psi')).toBeCloseTo(14.503773773, 8);
    expect(convert(1, 'mH2O', 'inH2O')).toBeCloseTo(1000 / 25.4, 9);
    expect(convert(1, 'impgal', 'usgal')).toBeCloseTo(1.200949925, 8);
  });

  it('returns the value unchanged for the same unit', () => {
    expect(convert(0.1 + 0.2, 'L', 'L')).toBe(0.1 + 0.2);
  });

  it('throws a TypeError across quantities and a RangeError for an unknown unit', () => {
    expect(() => convert(1, 'in', 'L' as Unit)).toThrow('Cannot convert in (length) to L (volume)');
    expect(() => convert(1, 'furlong' as Unit, 'm')).toThrow(RangeError);
    expect(() => quantityOf('gill' as Unit)).toThrow('Unknown unit "gill"');
  });

  it.each([
    ['length', LENGTH_UNITS],
    ['volume', VOLUME_UNITS],
    ['pressure', PRESSURE_UNITS],
    ['temperature', TEMPERATURE_UNITS],
  ] as const)('round-trips every pair of %s units', (_q, units) => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.constantFrom(...units), fc.constantFrom(...units), (x, a, b) => {
        const back = convert(convert(x, a as Unit, b as Unit), b as Unit, a as Unit);
        expect(Math.abs(back - x)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(x)));
      }),
      { numRuns: 300 },
    );
  });

  it('round-trips toSI and fromSI for every unit', () => {
    for (const unit of [...LENGTH_UNITS, ...VOLUME_UNITS, ...PRESSURE_UNITS, ...TEMPERATURE_UNITS]) {
      expect(fromSI(toSI(123.456, unit), unit)).toBeCloseTo(123.456, 10);
    }
  });
});

describe('displayUnits', () => {
  it('shows mm, L, kPa and °C for metric and in, US gal, psi and °F for us', () => {
    expect(displayUnits('metric')).toEqual({ length: 'mm', volume: 'L', pressure: 'kPa', temperature: 'C' });
    expect(displayUnits('us')).toEqual({ length: 'in', volume: 'usgal', pressure: 'psi', temperature: 'F' });
  });
});

describe('formatting', () => {
  it('groups thousands the en-US way', () => {
    expect(formatVolume(1234.4, 'metric')).toBe('1,234 L');
    expect(formatNumber(1234567.891, 2)).toBe('1,234,567.89');
  });

  it('shows US gallons for the us system (1,234 L = 325.99 gal)', () => {
    expect(formatVolume(1234, 'us')).toBe('326 gal');
    expect(formatVolume(1234, 'us', 1)).toBe('326.0 gal');
  });

  it('shows millimetres or inches with one decimal', () => {
    expect(formatLength(1250, 'metric')).toBe('1,250 mm');
    expect(formatLength(317.5, 'us')).toBe('12.5 in');
  });

  it('shows temperature in °C or °F', () => {
    expect(formatTemperature(18.5, 'metric')).toBe('18.5 °C');
    expect(formatTemperature(20, 'us')).toBe('68.0 °F');
  });

  it('shows pressure in kPa or psi', () => {
    expect(formatPressure(9.80665, 'metric')).toBe('9.8 kPa');
    expect(formatPressure(6.894757293168, 'us')).toBe('1.00 psi');
  });

  it('never prints −0 and prints a dash for a value that is not a number', () => {
    expect(formatVolume(-0.3, 'metric')).toBe('0 L');
    expect(formatVolume(Number.NaN, 'metric')).toBe('— L');
    expect(formatNumber(Number.POSITIVE_INFINITY)).toBe('—');
  });
});
