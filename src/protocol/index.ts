export { formatDuration } from './format-duration.ts';
export { type ScanTime, type ScanTimeSampling, scanTime } from './scan-time.ts';
export { type Protocol, type ProtocolInput, protocolSchema } from './schema.ts';
export { allowedText, fieldPath, parseOrThrow, problemsFromIssues } from './zod-problems.ts';
