export * from './line';
export * from './tmz';
export * from './dtft';
export * from './pulse';
export * from './measure';
export * from './mode-line';
