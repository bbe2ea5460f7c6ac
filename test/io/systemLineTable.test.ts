import { describe, expect, it } from 'vitest';
import { LineTableError } from '../../src/io/lineTable';
import { systemLineTableParse } from '../../src/io/systemLineTable';

describe('systemLineTableParse', () => {
  it('reads a plain single-band table unchanged (no system columns: nulls, cm^-1)', () => {
    const t = systemLineTableParse('J_up,K_up,J_lo,K_lo,wavenumber\n3,0,2,0,812.5\n');
    expect(t.rows[0]).toMatchObject({
      observedCm1: 812.5,
      uncertaintyCm1: 0.001,
      band: null,
      species: null,
      lUpper: null,
      lLower: null,
      unit: 'cm-1',
    });
  });

  it('converts MHz rows (position and uncertainty) with c, and reads band, species, l and tag columns', () => {
    const text =
      'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,Unit,band,species,l_up,l_lo,tag_up,tag_lo\n' +
      '1,0,0,0,9098.1152,0.0002,MHz,rot,HC3N,,,,\n' +
      '5,3,4,3,1020.1,0.0005,cm-1,hot,X,-1,-,e,\n';
    const t = systemLineTableParse(text);
    // Ref: 1 cm^-1 = 29 979.2458 MHz exactly (c, CODATA 2018).
    expect(t.rows[0].observedCm1).toBe(9098.1152 / 29979.2458);
    expect(t.rows[0].uncertaintyCm1).toBe(0.0002 / 29979.2458);
    expect(t.rows[0]).toMatchObject({ unit: 'MHz', band: 'rot', species: 'HC3N' });
    expect(t.rows[1]).toMatchObject({ lUpper: -1, lLower: -1, tagUpper: 'e', tagLower: null, band: 'hot' });
  });

  it('refuses an MHz row without its own uncertainty, a bad unit and a bad l, naming the line', () => {
    const head = 'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,unit,l_lo\n';
    const fail = (row: string) => {
      try {
        systemLineTableParse(head + row + '\n', { fileName: 'L.csv' });
      } catch (err) {
        expect(err).toBeInstanceOf(LineTableError);
        return (err as Error).message;
      }
      throw new Error('expected an error');
    };
    expect(fail('1,0,0,0,9098.1,,MHz,')).toBe('L.csv: line 2: an MHz line needs its own uncertainty (MHz) in the uncertainty column');
    expect(fail('1,0,0,0,9098.1,0.1,GHz,')).toBe("L.csv: line 2: unit 'GHz' must be cm-1 or MHz");
    expect(fail('1,0,0,0,9098.1,0.1,MHz,2')).toBe("L.csv: line 2: l_lo '2' must be +1, -1 or 0 (l = sign(kℓ))");
  });
});
