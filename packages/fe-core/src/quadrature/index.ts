export * from './gauss';
