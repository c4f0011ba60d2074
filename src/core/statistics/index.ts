export * from './summarize';
export * from './cpk';
export * from './histogram';
export * from './yield-breakdown';
export * from './bin-shares';
export * from './lot-trend';
export * from './bin-share-grid';
