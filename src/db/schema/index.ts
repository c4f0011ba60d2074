export * from './auth';
export * from './catalogue';
export * from './measurement';
export * from './stock';
