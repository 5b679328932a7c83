export * from './common';
export * from './team';
export * from './vehicle';
export * from './gauge-point';
export * from './test-session';
export * from './pose';
export * from './reading';
export * from './photo';
