export * from './schema';
export * from './time';
export * from './derive';
export * from './patterns';
