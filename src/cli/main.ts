/**
 * Headless front of the workbench: `npm run --silent cli -- <command> ...`.
 * Output on stdout, one-line errors on stderr with a non-zero exit, never a stack trace.
 */
import { readFileSync } from 'node:fs';
import { textDecode } from '../io/textDecode';
import { CliError, type CliCommand, type CliIo } from './cliIo';
import { CLI_HELP, cliHelpText, cliSynopsis } from './cliHelp';

/** Commands by name; each module is loaded only when used, so start-up stays fast. Their usage is in cliHelp.ts. */
const COMMANDS: Record<string, () => Promise<CliCommand>> = {
  simulate: async () => (await import('./simulateCommand')).simulateCommand,
  spectrum: async () => (await import('./spectrumCommand')).spectrumCommand,
  peaks: async () => (await import('./peaksCommand')).peaksCommand,
  fit: async () => (await import('./fitCommand')).fitCommand,
  combdiff: async () => (await import('./combdiffCommand')).combdiffCommand,
  assign: async () => (await import('./assignCommand')).assignCommand,
  perturbations: async () => (await import('./perturbationsCommand')).perturbationsCommand,
  contour: async () => (await import('./contourCommand')).contourCommand,
  classify: async () => (await import('./classifyCommand')).classifyCommand,
};

function usage(): string {
  return (
    'usage: cli <command> [options]   (cli <command> --help for its options, units and defaults)\n' +
    Object.keys(COMMANDS)
      .map((name) => '  ' + (CLI_HELP[name] ? cliSynopsis(name, CLI_HELP[name]) : name))
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
  const load = COMMANDS[name];
  if (!load) {
    io.stderr(`cli: unknown command '${name}'\n${usage()}`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    const help = CLI_HELP[name];
    io.stdout(help ? cliHelpText(name, help) : usage());
    return 0;
  }
  try {
    const command = await load();
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

/** The bytes of a file, or a CliError naming the path. */
function readBytes(path: string): Uint8Array {
  try {
    return readFileSync(path);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new CliError(`cannot read '${path}'${code === 'ENOENT' ? ': no such file' : code ? ` (${code})` : ''}`);
  }
}

/** Node io: text decoded by textDecode (UTF-8, UTF-16 with a byte-order mark or NUL bytes), paths named in errors. */
export const nodeIo: CliIo = {
  stdout: (t) => void process.stdout.write(t),
  stderr: (t) => void process.stderr.write(t),
  readFile: (path) => {
    const decoded = textDecode(readBytes(path));
    if (!decoded.ok) throw new CliError(`${path}: ${decoded.message}`);
    return decoded.text;
  },
  readBytes,
};

const isEntry = process.argv[1] && /main\.ts$/.test(process.argv[1]);
if (isEntry) {
  cliMain(process.argv.slice(2), nodeIo).then((code) => {
    // Let stdout drain before exiting so large CSV outputs are not cut.
    process.stdout.write('', () => process.exit(code));
  });
}
