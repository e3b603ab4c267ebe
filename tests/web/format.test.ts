import { describe, expect, it } from 'vitest';
import { formatDuration, formatNumber, formatRate } from '../../web/src/utils/format.ts';

describe('number formatting', () => {
  it('gives observables six significant digits', () => {
    expect(formatNumber(0.964912345, 'ns')).toBe('0.964912');
    expect(formatNumber(55.000001, 'nPivot')).toBe('55');
    expect(formatNumber(-0.000612345678, 'alphaS')).toBe('-6.12346e-4');
    expect(formatNumber(12345678, 'chi2')).toBe('1.23457e7');
  });
  it('writes r and other quantities spanning decades in exponent form', () => {
    expect(formatNumber(0.0035, 'r')).toBe('3.5e-3');
    expect(formatNumber(0.12, 'r')).toBe('1.2e-1');
    expect(formatNumber(8.123456789e15, 'energyScaleGeV')).toBe('8.12346e15');
  });
  it('shows missing values as a dash and integers whole', () => {
    expect(formatNumber(null, 'exactNs')).toBe('—');
    expect(formatNumber(undefined)).toBe('—');
    expect(formatNumber(0, 'r')).toBe('0');
    expect(formatNumber(1234, 'pointIndex')).toBe('1234');
  });
  it('reads durations and rates at a glance', () => {
    expect(formatDuration(12.4)).toBe('12 s');
    expect(formatDuration(200)).toBe('3 min 20 s');
    expect(formatDuration(7500)).toBe('2 h 5 min');
    expect(formatDuration(null)).toBe('—');
    expect(formatRate(2345.6)).toBe('2,346 points/s');
    expect(formatRate(12.345)).toBe('12.3 points/s');
    expect(formatRate(0)).toBe('0 points/s');
  });
});
