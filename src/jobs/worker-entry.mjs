// Worker-thread bootstrap. Node 20 does not apply `--import` loaders passed in a worker's execArgv
// to ESM imports, so each thread registers tsx's ESM hooks itself (tsx/esm/api) before loading the
// TypeScript task runner. Plain JavaScript on purpose: it runs before any TypeScript support exists.
import { register } from 'tsx/esm/api';

register();
const { default: runTask } = await import('./worker.ts');

export default runTask;
