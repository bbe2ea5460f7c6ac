/** Public names of src/fit (re-exports; one concept per file). */
export * from './assignment';
export * from './bandDesign';
export * from './combinationDifferences';
export * from './contourFit';
export * from './fitBand';
export * from './fitCheck';
export * from './fitPredict';
export * from './fitResultBuild';
export * from './fitTypes';
export * from './householderQr';
export * from './jacobiSvd';
export * from './leastSquares';
export * from './leastSquaresLinearise';
export * from './qBranchFit';
export * from './rankDiagnosis';
