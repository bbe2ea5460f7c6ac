/** Public names of src/physics/interaction: interacting vibrational states diagonalised together (issue 17). */
export * from './coupledLevels';
export * from './coupledLines';
export * from './householderEigen';
export * from './interactionTerms';
export * from './speciesLevelSources';
