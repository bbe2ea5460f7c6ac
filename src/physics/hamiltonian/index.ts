/** Public names of src/physics/hamiltonian: effective Hamiltonians of real symmetric tops (issue 16). */
export * from './degenerateStateLevels';
export * from './eigenLabels';
export * from './hamiltonianLevel';
export * from './hamiltonianTermsCheck';
export * from './inversionStateLevels';
export * from './nondegenerateStateLevels';
export * from './rotorPolynomial';
export * from './rovibSymmetry';
export * from './spinStatistics';
export * from './symmetricEigen';
export * from './transitionsAllowed';
export * from './linearPiStateLevels';
