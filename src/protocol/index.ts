export { allowedText, fieldPath, parseOrThrow, problemsFromIssues } from '../core/zod-problems.ts';
export { formatDuration } from './format-duration.ts';
export { type ScanTimeSampling, scanTime } from './scan-time.ts';
export { type ScanTime, scanTimeResultSchema } from './scan-time-result.ts';
export { type Protocol, type ProtocolInput, protocolSchema } from './schema.ts';
export { acquisitionScanTime, patternGrid } from './volume-scan-time.ts';
