export * from './common';
export * from './auth';
export * from './people';
export * from './farms';
export * from './tanks';
export * from './readings';
export * from './board';
export * from './gauge';
