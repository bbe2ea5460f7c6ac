import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import { systemLines } from '../physics/system/systemLines';
import type { SystemFile } from '../io/systemFile';
import { cliLoadModelOrSystem } from './cliModel';
import { cliNumber, cliParseArgs, cliRequire, type CliCommand, type CliIo } from './cliIo';

/**
 * `simulate --model M.json [--min-intensity X]`: CSV J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label
 * with one row per distinct line, ascending wavenumber. wavenumber and E_lo in cm^-1, intensity
 * relative (strongest = 1).
 * With a system file (JSON with "species"), every band of every species, on one intensity scale
 * (strongest line of all = 1), with the columns band, species, l_up, l_lo, tag_up, tag_lo after
 * the contract's; E_lo is then the lower level's energy above the species' lowest level. When a
 * species declares a point group, two more columns follow: sym_up, sym_lo (the levels' symmetry
 * species, e.g. A1, E, A2'', empty for a species without one).
 */
export const simulateCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'min-intensity']);
  const loaded = cliLoadModelOrSystem(cliRequire(opts, 'model'), io);
  if (loaded.kind === 'system') return simulateSystem(loaded.file, cliNumber(opts, 'min-intensity', 0), io);
  const file = loaded.file;
  const lines = bandLines(file.model, { minIntensity: cliNumber(opts, 'min-intensity', 0) });
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const rows: string[] = ['J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label'];
  for (const i of order) {
    rows.push(
      `${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]},` +
        `${lines.wavenumberCm1[i].toFixed(7)},${lines.intensity[i].toPrecision(6)},${lines.eLowerCm1[i].toFixed(6)},` +
        lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], file.model.shape),
    );
  }
  io.stdout(rows.join('\n') + '\n');
  return 0;
};

/** Every line of every band of a system file, ascending wavenumber; the contract's columns, then band and labels. */
function simulateSystem(file: SystemFile, minIntensity: number, io: CliIo): number {
  const lines = systemLines(file.model, { minIntensity });
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const withSymmetry = file.model.species.some((s) => s.pointGroup !== undefined);
  const rows: string[] = [
    'J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label,band,species,l_up,l_lo,tag_up,tag_lo' + (withSymmetry ? ',sym_up,sym_lo' : ''),
  ];
  const signed = (l: number) => (l > 0 ? '+1' : l < 0 ? '-1' : '0');
  for (const i of order) {
    const ref = lines.bandRefs[lines.bandIndex[i]];
    const shape = file.model.species[ref.speciesIndex].shape;
    rows.push(
      `${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]},` +
        `${lines.wavenumberCm1[i].toFixed(7)},${lines.intensity[i].toPrecision(6)},${lines.eLowerCm1[i].toFixed(6)},` +
        lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], shape) +
        `,${ref.band},${ref.species},${signed(lines.lUpper[i])},${signed(lines.lLower[i])},${lines.tagUpper[i]},${lines.tagLower[i]}` +
        (withSymmetry ? `,${lines.symUpper[i]},${lines.symLower[i]}` : ''),
    );
  }
  io.stdout(rows.join('\n') + '\n');
  return 0;
}
