export * from './auth';
export * from './clinic';
export * from './errors';
export * from './sync';
export * from './dates';
export * from './password';
