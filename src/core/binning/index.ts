export * from './bin-plan';
export * from './bin-edges';
export * from './bin-code';
export * from './bin-label';
export * from './assign-bin';
export * from './bin-catalogue';
export * from './plan-moves';
export * from './stable-bin-codes';
