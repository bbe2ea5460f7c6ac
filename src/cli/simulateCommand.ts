import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import { cliLoadModel } from './cliModel';
import { cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/**
 * `simulate --model M.json [--min-intensity X]`: CSV J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label
 * with one row per distinct line, ascending wavenumber. wavenumber and E_lo in cm^-1, intensity
 * relative (strongest = 1).
 */
export const simulateCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'min-intensity']);
  const file = cliLoadModel(cliRequire(opts, 'model'), io);
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
