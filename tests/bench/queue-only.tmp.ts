import { benchQueue } from './queue.bench.ts';

for (const r of await benchQueue()) console.log(`| ${r.name} | ${r.medianMs.toFixed(0)} | ${r.note} |`);
