// Recorder files: our own CSV format, column mappings for other recorders' exports, detection of
// the layout, and the row parser and validator shared by uploads and the live ingest.
// Pure TypeScript (papaparse + zod): runs on the server and in the browser.
export * from './format';
export * from './mapping';
export * from './values';
export * from './row';
export * from './detect';
export * from './parse';
