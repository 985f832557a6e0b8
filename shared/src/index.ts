export * from './roles.types.js';
export * from './auth.types.js';
export * from './api.types.js';
export * from './practice.types.js';
export * from './teeth.util.js';
export * from './phone.util.js';
export * from './estimates.types.js';
export * from './referrals.types.js';
