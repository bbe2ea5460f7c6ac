import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CLI_HELP, cliHelpText, cliSynopsis } from '../../src/cli/cliHelp';
import type { CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { textDecode } from '../../src/io/textDecode';

function memoryIo(read: (path: string) => string = () => '') {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { stdout: (t) => void out.push(t), stderr: (t) => void err.push(t), readFile: read };
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

/** The options a command accepts, from its own "unknown option" refusal (so the list is the parser's, not the help's). */
async function knownOptions(command: string): Promise<string[]> {
  const m = memoryIo();
  expect(await cliMain([command, '--no-such-option', 'x'], m.io)).toBe(1);
  const known = /\(known: (.*)\)\n$/.exec(m.stderr());
  if (!known) throw new Error(m.stderr());
  return known[1].split(', ').map((o) => o.replace(/^--/, ''));
}

describe('command help', () => {
  const names = Object.keys(CLI_HELP);

  it('covers every command', () => {
    expect(names).toEqual(['simulate', 'spectrum', 'peaks', 'fit', 'combdiff', 'assign', 'contour', 'classify', 'perturbations']);
  });

  it.each(names)('%s --help and -h print the usage on stdout, exit 0, nothing on stderr', async (name) => {
    for (const flag of ['--help', '-h']) {
      const m = memoryIo(() => {
        throw new Error('help must not read files');
      });
      expect(await cliMain([name, flag], m.io)).toBe(0);
      expect(m.stderr()).toBe('');
      expect(m.stdout()).toBe(cliHelpText(name, CLI_HELP[name]));
      expect(m.stdout()).toMatch(new RegExp(`^usage: cli ${name} `));
      expect(m.stdout()).toMatch(/\nexample:\n {2}npm run --silent cli -- /);
    }
  });

  it('answers --help even after other options, and before a missing required option is noticed', async () => {
    const m = memoryIo();
    expect(await cliMain(['assign', '--tolerance', '4', '--help'], m.io)).toBe(0);
    expect(m.stdout()).toMatch(/^usage: cli assign --model M\.json --trace FILE/);
  });

  it.each(names)('%s: the help lists exactly the options the command accepts, each with a unit and a default', async (name) => {
    const help = CLI_HELP[name];
    expect(help.options.map((o) => o.name).sort()).toEqual((await knownOptions(name)).sort());
    const text = cliHelpText(name, help);
    for (const o of help.options) {
      const line = text.split('\n').find((l) => l.startsWith(`  --${o.name}${o.value ? ` ${o.value}` : ''} `));
      expect(line, o.name).toBeDefined();
      expect(line).toMatch(/ Unit: [^.]+\. (Default: .+|Required.*)\.$/);
    }
  });

  it.each(names)('%s: the example names only documented options', (name) => {
    const help = CLI_HELP[name];
    const args = help.example.split(' -- ')[1].split(/\s+/);
    expect(args[0]).toBe(name);
    for (const a of args.filter((a) => a.startsWith('--'))) expect(help.options.map((o) => `--${o.name}`)).toContain(a);
  });

  it.each(['simulate', 'spectrum', 'peaks'])('%s: the example runs on the demo files with exit 0', async (name) => {
    const args = CLI_HELP[name].example.split(' -- ')[1].split(/\s+/);
    const m = memoryIo((path) => {
      const decoded = textDecode(new Uint8Array(readFileSync(new URL(`../../${path}`, import.meta.url))));
      if (!decoded.ok) throw new Error(decoded.message);
      return decoded.text;
    });
    expect(await cliMain(args, m.io), m.stderr()).toBe(0);
    expect(m.stdout().split('\n').length).toBeGreaterThan(10);
  });

  it('cli --help lists each command by its synopsis', async () => {
    const m = memoryIo();
    expect(await cliMain(['--help'], m.io)).toBe(0);
    for (const name of names) expect(m.stdout()).toContain(`  ${cliSynopsis(name, CLI_HELP[name])}\n`);
    expect(cliSynopsis('peaks', CLI_HELP.peaks)).toBe('peaks --trace FILE [--min-snr S] [--noise SIGMA] [--baseline]');
  });
});
