// Vitest runs server modules directly in Node; the "server-only" marker only matters to the Next bundler.
export {};
