import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

function memoryIo(readFile: (path: string) => string = () => '') {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { stdout: (t) => void out.push(t), stderr: (t) => void err.push(t), readFile };
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

describe('cliMain', () => {
  it('prints usage on stdout for help (exit 0) and with no command (exit 2)', async () => {
    const help = memoryIo();
    expect(await cliMain(['--help'], help.io)).toBe(0);
    expect(help.stdout()).toMatch(/^usage: cli <command>/);
    expect(help.stdout()).toMatch(/spectrum --model M\.json --from X1 --to X2 --step DX \[--mass AMU\] \[--lorentz HWHM\]/);
    const none = memoryIo();
    expect(await cliMain([], none.io)).toBe(2);
    expect(none.stdout()).toMatch(/simulate --model M\.json/);
  });

  it('refuses an unknown command with exit 2', async () => {
    const m = memoryIo();
    expect(await cliMain(['frobnicate'], m.io)).toBe(2);
    expect(m.stderr()).toMatch(/^cli: unknown command 'frobnicate'/);
  });

  it('turns a CliError into one line on stderr with exit 1', async () => {
    const m = memoryIo();
    expect(await cliMain(['simulate', '--colour', 'red'], m.io)).toBe(1);
    expect(m.stderr()).toBe('simulate: unknown option --colour (known: --model, --min-intensity)\n');
  });

  it('turns an unexpected error into one line with exit 70, never a stack trace', async () => {
    const m = memoryIo(() => {
      throw new Error('disk on fire');
    });
    expect(await cliMain(['simulate', '--model', 'x.json'], m.io)).toBe(70);
    expect(m.stderr()).toBe('simulate: internal error: disk on fire\n');
  });
});

describe('cliParseArgs, cliRequire, cliNumber', () => {
  it('reads --name value, --name=value and flags', () => {
    expect(cliParseArgs(['--a', '1', '--b=2', '--c'], ['a', 'b'], ['c'])).toEqual({ a: '1', b: '2', c: true });
  });

  it('refuses bare words, missing values and unknown options', () => {
    expect(() => cliParseArgs(['x'], ['a'])).toThrow(CliError);
    expect(() => cliParseArgs(['x'], ['a'])).toThrow(/unexpected argument 'x'/);
    expect(() => cliParseArgs(['--a'], ['a'])).toThrow(/option --a needs a value/);
    expect(() => cliParseArgs(['--z', '1'], ['a'])).toThrow(/unknown option --z \(known: --a\)/);
  });

  it('requires options and reads finite numbers', () => {
    expect(() => cliRequire({}, 'model')).toThrow(/missing required option --model/);
    expect(cliNumber({ x: '1e-3' }, 'x')).toBe(0.001);
    expect(cliNumber({}, 'x', 7)).toBe(7);
    expect(() => cliNumber({ x: 'NaN' }, 'x')).toThrow(/--x must be a finite number, got 'NaN'/);
    expect(() => cliNumber({ x: 'Infinity' }, 'x')).toThrow(/finite/);
    expect(() => cliNumber({ x: true }, 'x')).toThrow(/finite/);
  });
});

describe('cli entry (subprocess)', () => {
  it('exits non-zero with one line on stderr for a missing model file via npm run cli', () => {
    const r = spawnSync('npm', ['run', '--silent', 'cli', '--', 'simulate', '--model', 'no-such-model.json'], {
      cwd: ROOT,
      encoding: 'utf8',
    });
    expect(r.status).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe("simulate: cannot read 'no-such-model.json': no such file\n");
  });

  it('exits 2 for an unknown command', () => {
    const r = spawnSync('npx', ['tsx', 'src/cli/main.ts', 'frobnicate'], { cwd: ROOT, encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^cli: unknown command 'frobnicate'/);
  });
});
