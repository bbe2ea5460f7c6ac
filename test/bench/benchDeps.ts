/** The engine functions the benchmark times, gathered in one place. */
import { modelFileFromJson } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import { spectrumSynthesizeWindowed } from '../../src/physics/spectrum';
import { peaksFindSimple } from '../../src/analysis/peaksFindSimple';
import { fitBand } from '../../src/fit/fitBand';
import { delimitedParseNumeric } from '../../src/io/delimitedParseNumeric';

/** The engine entry points used by the workloads. */
export function analysisRequire() {
  return { modelFileFromJson, bandLines, spectrumSynthesizeWindowed, peaksFindSimple, fitBand, delimitedParseNumeric };
}
