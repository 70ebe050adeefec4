export * from './common';
export * from './auth';
export * from './people';
export * from './farms';
