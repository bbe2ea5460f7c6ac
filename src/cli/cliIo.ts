/** What a CLI command may touch: output streams and the file system, injectable for tests. */
export interface CliIo {
  /** Write text to standard output (no newline added). */
  stdout(text: string): void;
  /** Write text to standard error (no newline added). */
  stderr(text: string): void;
  /**
   * Read a whole text file (decoded by `textDecode`: UTF-8, or UTF-16 with a byte-order mark or NUL
   * bytes); throws an Error naming the path when it cannot.
   */
  readFile(path: string): string;
  /** Read a whole file as bytes (traces are decoded by the importer, which then names the encoding). Optional. */
  readBytes?(path: string): Uint8Array;
}

/** A user-facing CLI failure: printed as one line on stderr, exit code 1 (or the given code). */
export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
    this.name = 'CliError';
  }
}

/**
 * Parse `--name value` pairs and bare `--flag`s.
 * @param args argument list after the command name
 * @param valued names that take a value
 * @param flags names that take none
 */
export function cliParseArgs(args: string[], valued: readonly string[], flags: readonly string[] = []): Record<string, string | true> {
  const out: Record<string, string | true> = {};
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (!arg.startsWith('--')) throw new CliError(`unexpected argument '${arg}'`);
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq > 0 ? eq : undefined);
    if (flags.includes(name)) {
      out[name] = true;
    } else if (valued.includes(name)) {
      const value = eq > 0 ? arg.slice(eq + 1) : args[++i];
      if (value === undefined) throw new CliError(`option --${name} needs a value`);
      out[name] = value;
    } else {
      throw new CliError(`unknown option --${name} (known: ${[...valued, ...flags].map((n) => '--' + n).join(', ')})`);
    }
  }
  return out;
}

/** The value of a required option, or a CliError naming it. */
export function cliRequire(opts: Record<string, string | true>, name: string): string {
  const v = opts[name];
  if (typeof v !== 'string') throw new CliError(`missing required option --${name}`);
  return v;
}

/** A finite number from an option, or a CliError naming it and the value. */
export function cliNumber(opts: Record<string, string | true>, name: string, fallback?: number): number {
  const v = opts[name];
  if (v === undefined) {
    if (fallback === undefined) throw new CliError(`missing required option --${name}`);
    return fallback;
  }
  const n = typeof v === 'string' ? Number(v) : NaN;
  if (!Number.isFinite(n)) throw new CliError(`option --${name} must be a finite number, got '${String(v)}'`);
  return n;
}

/** A command: receives its arguments and the io, returns the exit code. */
export type CliCommand = (args: string[], io: CliIo) => Promise<number> | number;
