export * from './materials';
export * from './runs';
