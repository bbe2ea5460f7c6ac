import { describe, expect, it } from 'vitest';
import {
  assignmentLevelLabels,
  levelSymmetryText,
  lineLevelLabel,
  lineLevelLabelsSubset,
  transitionSymmetryText,
} from '../../src/state/systemLevelLabels';

describe('levelSymmetryText and transitionSymmetryText', () => {
  it('gives nothing when neither level has a tag or species', () => {
    expect(levelSymmetryText('', '')).toBe('');
    expect(transitionSymmetryText({})).toBe('');
    expect(transitionSymmetryText({ tagUpper: '', tagLower: '', symUpper: '', symLower: '' })).toBe('');
  });

  it('prefers the tag, writes primes typographically and splits an s/a tag from its species', () => {
    expect(levelSymmetryText('A1', 'A1')).toBe('A1');
    expect(levelSymmetryText('', 'E')).toBe('E');
    expect(levelSymmetryText("a:A2''", "A2''")).toBe('a A2″');
    expect(levelSymmetryText('', "A1'")).toBe('A1′');
    expect(levelSymmetryText('e', undefined)).toBe('e');
  });

  it('writes upper ← lower, with ? for a side that is not known', () => {
    expect(transitionSymmetryText({ tagUpper: 'A1', tagLower: 'A2' })).toBe('A1 ← A2');
    expect(transitionSymmetryText({ tagUpper: '', symUpper: 'E', tagLower: 'A2', symLower: '' })).toBe('E ← A2');
    expect(transitionSymmetryText({ tagUpper: 'A2' })).toBe('A2 ← ?');
  });
});

describe('assignmentLevelLabels', () => {
  it('keeps tags that are set and l that is not 0, nothing else', () => {
    expect(assignmentLevelLabels({ lUpper: 0, lLower: 0, tagUpper: '', tagLower: '' })).toEqual({});
    expect(assignmentLevelLabels({ lUpper: -1, lLower: 0, tagUpper: 'A1', tagLower: '' })).toEqual({ lUpper: -1, tagUpper: 'A1' });
    expect(assignmentLevelLabels({ lUpper: 1, lLower: -1, tagUpper: 's', tagLower: "a:A2''" })).toEqual({
      lUpper: 1,
      lLower: -1,
      tagUpper: 's',
      tagLower: "a:A2''",
    });
  });
});

describe('lineLevelLabelsSubset and lineLevelLabel', () => {
  it('picks the labels of the chosen lines in order', () => {
    const all = {
      lUpper: Int8Array.from([1, -1, 0]),
      lLower: Int8Array.from([0, 0, 0]),
      tagUpper: ['A1', 'A2', ''],
      tagLower: ['A2', 'A1', ''],
      symUpper: ['A1', 'A2', 'E'],
      symLower: ['A2', 'A1', 'A1'],
    };
    const sub = lineLevelLabelsSubset(all, Int32Array.from([2, 0]));
    expect(lineLevelLabel(sub, 0)).toEqual({ lUpper: 0, lLower: 0, tagUpper: '', tagLower: '', symUpper: 'E', symLower: 'A1' });
    expect(lineLevelLabel(sub, 1)).toEqual({ lUpper: 1, lLower: 0, tagUpper: 'A1', tagLower: 'A2', symUpper: 'A1', symLower: 'A2' });
  });
});
