export * from './common';
export * from './team';
export * from '../records/vehicle';
export * from '../records/gauge-point';
export * from '../records/test-session';
export * from '../records/pose';
export * from '../records/reading';
export * from './photo';
