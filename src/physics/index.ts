/** Public names of src/physics (re-exports; one concept per file). */
export * from './bandLadders';
export * from './bandLines';
export * from './bandSymmetry';
export * from './constants';
export * from './faddeeva';
export * from './honlLondon';
export * from './lineLabel';
export * from './lineShape';
export * from './lineShapeVoigtTable';
export * from './model';
export * from './partitionFunction';
export * from './spectrum';
export * from './spectrumAddVoigt';
export * from './spectrumFft';
export * from './spectrumTail';
export * from './termValues';
export * from './transitionCheck';
