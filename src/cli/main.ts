/**
 * Headless front of the workbench: `npm run --silent cli -- <command> ...`.
 * Output on stdout, one-line errors on stderr with a non-zero exit, never a stack trace.
 */
import { readFileSync } from 'node:fs';
import { CliError, type CliCommand, type CliIo } from './cliIo';

/** Commands by name; each module is loaded only when used, so start-up stays fast. */
const COMMANDS: Record<string, { summary: string; load: () => Promise<CliCommand> }> = {
  simulate: { summary: 'simulate --model M.json', load: async () => (await import('./simulateCommand')).simulateCommand },
  spectrum: {
    summary:
      'spectrum --model M.json --from X1 --to X2 --step DX [--mass AMU] [--lorentz HWHM] [--opd L [--apodization NAME] [--depth-scale S]]',
    load: async () => (await import('./spectrumCommand')).spectrumCommand,
  },
  peaks: { summary: 'peaks --trace FILE [--min-snr S]', load: async () => (await import('./peaksCommand')).peaksCommand },
  fit: { summary: 'fit --model M.json --lines L.csv', load: async () => (await import('./fitCommand')).fitCommand },
  combdiff: {
    summary: 'combdiff --lines L.csv --state lower|upper [--shape prolate|oblate]',
    load: async () => (await import('./combdiffCommand')).combdiffCommand,
  },
  assign: {
    summary: 'assign --model M.json --trace FILE [--lines SEED.csv] [--tolerance K]',
    load: async () => (await import('./assignCommand')).assignCommand,
  },
  contour: {
    summary:
      'contour --model M.json --trace FILE --from X1 --to X2 --opd L [--apodization NAME] [--mass AMU] [--lorentz HWHM] [--float key1,key2,...]',
    load: async () => (await import('./contourCommand')).contourCommand,
  },
  classify: {
    summary: 'classify --trace FILE --from X1 --to X2 [--temperature K]',
    load: async () => (await import('./classifyCommand')).classifyCommand,
  },
};

function usage(): string {
  return (
    'usage: cli <command> [options]\n' +
    Object.values(COMMANDS)
      .map((c) => '  ' + c.summary)
      .join('\n') +
    '\n'
  );
}

/** Run one CLI invocation; returns the exit code. */
export async function cliMain(argv: string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.stdout(usage());
    return name ? 0 : 2;
  }
  const entry = COMMANDS[name];
  if (!entry) {
    io.stderr(`cli: unknown command '${name}'\n${usage()}`);
    return 2;
  }
  try {
    const command = await entry.load();
    return await command(rest, io);
  } catch (err) {
    if (err instanceof CliError) {
      io.stderr(`${name}: ${err.message}\n`);
      return err.exitCode;
    }
    // Unexpected failures still end as one line, never a stack trace.
    io.stderr(`${name}: internal error: ${err instanceof Error ? err.message : String(err)}\n`);
    return 70;
  }
}

/** Node io: files read as UTF-8, paths named in errors. */
export const nodeIo: CliIo = {
  stdout: (t) => void process.stdout.write(t),
  stderr: (t) => void process.stderr.write(t),
  readFile: (path) => {
    try {
      return readFileSync(path, 'utf8');
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      throw new CliError(`cannot read '${path}'${code === 'ENOENT' ? ': no such file' : code ? ` (${code})` : ''}`);
    }
  },
};

const isEntry = process.argv[1] && /main\.ts$/.test(process.argv[1]);
if (isEntry) {
  cliMain(process.argv.slice(2), nodeIo).then((code) => {
    // Let stdout drain before exiting so large CSV outputs are not cut.
    process.stdout.write('', () => process.exit(code));
  });
}
