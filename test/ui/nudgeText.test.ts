import { describe, expect, it } from 'vitest';
import { nudgeText } from '../../src/ui/nudgeText';

describe('nudgeText', () => {
  it('returns null for text that is not a plain number', () => {
    expect(nudgeText('', 1)).toBeNull();
    expect(nudgeText('abc', 1)).toBeNull();
    expect(nudgeText('.', 1)).toBeNull();
  });
  it('moves the last typed decimal place by one (hand-checked)', () => {
    expect(nudgeText('0.2913', 1)).toBe('0.2914');
    expect(nudgeText('0.2913', -1)).toBe('0.2912');
    expect(nudgeText('1148.75', 1)).toBe('1148.76');
    expect(nudgeText('12', -1)).toBe('11');
    expect(nudgeText('0.10', -1)).toBe('0.09');
  });
  it('keeps exponent notation and steps its mantissa', () => {
    expect(nudgeText('3e-7', 1)).toBe('4e-7');
    expect(nudgeText('2.5e-6', -1)).toBe('2.4e-6');
  });
});
