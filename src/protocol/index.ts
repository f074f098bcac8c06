export { formatDuration } from './format-duration.ts';
export { type ScanTimeSampling, scanTime } from './scan-time.ts';
export { type ScanTime, scanTimeResultSchema } from './scan-time-result.ts';
export { type Protocol, type ProtocolInput, protocolSchema } from './schema.ts';
export { allowedText, fieldPath, parseOrThrow, problemsFromIssues } from './zod-problems.ts';
