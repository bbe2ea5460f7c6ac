import { modelFileParse, ModelFileError, type ModelFile } from '../io/modelFile';
import { CliError, type CliIo } from './cliIo';

/** Read and validate a model file for a CLI command; warnings go to stderr. */
export function cliLoadModel(path: string, io: CliIo): ModelFile {
  const text = io.readFile(path);
  try {
    const file = modelFileParse(text);
    for (const w of file.warnings) io.stderr(`${path}: ${w}\n`);
    return file;
  } catch (err) {
    if (err instanceof ModelFileError) throw new CliError(`${path}: ${err.message}`);
    throw err;
  }
}
