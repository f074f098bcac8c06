import { benchVolume } from '/work/wt/volumes-3d/tests/bench/volume.bench.ts';

for (const row of await benchVolume())
  console.log(`| volumes | ${row.name} | ${row.medianMs.toFixed(2)} | ${row.note} |`);
