import { describe, expect, it } from 'vitest';
import { TraceSkipLog, traceLineList, traceSkipMessage } from '../../src/io/traceSkipLog';

describe('traceLineList', () => {
  it('writes one line in the singular', () => {
    expect(traceLineList([7])).toBe('line 7');
  });
  it('lists up to ten lines and counts the rest', () => {
    expect(traceLineList([5, 9, 12])).toBe('lines 5, 9, 12');
    const many = Array.from({ length: 25 }, (_, i) => i + 1);
    expect(traceLineList(many)).toBe('lines 1, 2, 3, 4, 5, 6, 7, 8, 9, 10 and 15 more');
  });
});

describe('traceSkipMessage', () => {
  it('says nothing when nothing was skipped', () => {
    expect(traceSkipMessage(new TraceSkipLog(), 'row')).toBeUndefined();
  });
  it('reads "3 rows skipped: lines 5, 9, 12 (reason)" for a single reason', () => {
    const log = new TraceSkipLog();
    for (const l of [9, 5, 12]) log.add(l, 'non-numeric');
    expect(traceSkipMessage(log, 'row')).toBe('3 rows skipped: lines 5, 9, 12 (non-numeric)');
  });
  it('breaks several reasons down with counts and merges repeated lines', () => {
    const log = new TraceSkipLog();
    log.add(4, 'non-numeric');
    log.add(6, 'NaN/Infinity');
    log.add(6, 'NaN/Infinity');
    expect(traceSkipMessage(log, 'point')).toBe('3 points skipped: lines 4, 6 (non-numeric: 1, NaN/Infinity: 2)');
    expect(log.sortedLines()).toEqual([4, 6]);
  });
  it('writes the singular for one row', () => {
    const log = new TraceSkipLog();
    log.add(2, 'duplicate x');
    expect(traceSkipMessage(log, 'row')).toBe('1 row skipped: line 2 (duplicate x)');
  });
});
