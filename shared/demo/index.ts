export * from './willowmere';
export * from './make-roster';
