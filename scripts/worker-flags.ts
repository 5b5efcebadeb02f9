/**
 * Node flags of the worker process (server/jobs/worker.ts), for `npm start`, `npm test` and the
 * benchmarks alike. A dataset.ingest of a large file allocates short-lived strings and row arrays at a
 * high rate; a larger young generation (32 MB semi-spaces instead of 16) means fewer scavenges and
 * less promotion, a measurable part of the worker's CPU on a 1,000,000-row file.
 */
export const WORKER_NODE_FLAGS = ["--max-semi-space-size=32"];
