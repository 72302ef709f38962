export * from './errors';
export * from './constants';
export * from './courant';
export * from './dispersion';
export * from './grading';
export * from './cpml';
export * from './continuous';
export * from './reflection';
