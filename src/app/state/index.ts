/** Public API of the app state layer (pure: document model, commands, inverse-delta history). */
export * from './document.js';
export * from './params.js';
export * from './geometry.js';
export * from './store.js';
export * from './commands.js';
export * from './remeasure.js';
