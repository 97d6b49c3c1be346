// Pure display formatters, safe on server and client alike.
export * from './money';
export * from './temperature';
export * from './dates';
export * from './length';
export * from './labels';
