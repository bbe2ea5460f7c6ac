/** Run the command line in memory: files from a map, stdout and stderr collected. */
import { CliError, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';

/**
 * @param args the command line after the program name (command first)
 * @param files path → text of every file the command may read; any other path is "no such file"
 * @returns the exit code and everything written to stdout and stderr
 */
export async function cliRunMemory(
  args: string[],
  files: Record<string, string>,
): Promise<{ code: number; stdout: string; stderr: string }> {
  const out = { stdout: '', stderr: '' };
  const io: CliIo = {
    stdout: (t) => void (out.stdout += t),
    stderr: (t) => void (out.stderr += t),
    readFile: (p) => {
      if (p in files) return files[p];
      throw new CliError(`cannot read '${p}': no such file`);
    },
  };
  const code = await cliMain(args, io);
  return { code, ...out };
}
