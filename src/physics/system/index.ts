export * from './bandRules';
export * from './levelTypes';
export * from './systemLines';
export * from './systemModel';
export * from './systemStateLevels';
export * from './termLevels';
export * from './vibrationalPartition';
export * from './systemFromBandModel';
