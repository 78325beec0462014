export * from './constants.ts';
export * from './units.ts';
export * from './convert.ts';
export * from './presets.ts';
export * from './format.ts';
export * from './quantityUnits.ts';
export * from './scale.ts';
export * from './pressureHead.ts';
