export * from './materials';
export * from './runs';
export * from './model';
export * from './materialPoint';
export * from './studies';
export * from './templates';
export * from './notifications';
export * from './tokens';
