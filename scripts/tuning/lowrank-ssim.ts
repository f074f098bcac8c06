/**
 * Where lowrank-hankel loses SSIM on anatomy: SSIM over the whole image, over the object
 * (|reference| > 0.1·peak) and over the background, beside cs-tv, on the tuning set at R 4.
 *
 *   npx tsx scripts/tuning/lowrank-ssim.ts --n=96 --shard=0/2 --out=/tmp/lowrank-0.csv   (and 1/2)
 *   npx tsx scripts/tuning/lowrank-ssim.ts --accelerations=2,4,8 --ranks=18,25,32,38 \
 *     --slices=inia19-t1-brain:72,example4d:12 --out=/tmp/lowrank-ranks.csv   (fixed-rank sweep)
 *   npx tsx scripts/tuning/lowrank-ssim.ts --accelerations=2,4,8 --ranks=25,default --shard=0/2 \
 *     --out=/tmp/lowrank-before-after-0.csv   (the old fixed rank 25 against the rank rule)
 *
 * Rows join into docs/tuning/lowrank-hankel-ssim.csv; docs/design.md §3.12 reads them.
 */
import { writeFileSync } from 'node:fs';
import { ssim } from '../../src/metrics/index.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import type { MethodSpec } from '../../src/recon/index.ts';
import { loadTuningSet } from './anatomy-set.ts';
import { scriptArguments, TUNING_MASKS } from './cases.ts';

const args = scriptArguments(process.argv.slice(2));
const n = Number(args.get('n') ?? 96);
const accelerations = (args.get('accelerations') ?? '4').split(',').map(Number);
/** `--ranks=25,default`: fixed ranks, or the method's default rank rule. */
const ranks = args.get('ranks')?.split(',');
const slices = args.get('slices')?.split(',');
const METHODS: { label: string; spec: MethodSpec }[] = ranks
  ? ranks.map((rank) =>
      rank === 'default'
        ? { label: 'lowrank-hankel default', spec: { name: 'lowrank-hankel' } }
        : { label: `lowrank-hankel rank ${rank}`, spec: { name: 'lowrank-hankel', rank: Number(rank) } },
    )
  : [
      { label: 'cs-tv default', spec: { name: 'cs-tv' } },
      { label: 'lowrank-hankel default', spec: { name: 'lowrank-hankel' } },
      { label: 'lowrank-hankel rank 32', spec: { name: 'lowrank-hankel', rank: 32 } },
    ];
const [shard, shards] = (args.get('shard') ?? '0/1').split('/').map(Number);
const out = args.get('out') ?? '/tmp/lowrank-ssim.csv';
const set = (await loadTuningSet(n))
  .filter((slice) => !slices || slices.includes(slice.label))
  .filter((_, i) => i % shards === shard);
const lines = ['slice,mask,acceleration,fraction,method,rank,nrmse,ssim,ssim_object,ssim_background'];
for (const slice of set) {
  const reference = slice.image;
  const object = reference.data.map((v) => (v > 0.1 ? 1 : 0));
  const inObject = Uint8Array.from(object);
  const inBackground = Uint8Array.from(object, (v) => 1 - v);
  for (const [mask, sampling] of Object.entries(TUNING_MASKS)) {
    for (const acceleration of accelerations) {
      for (const { label, spec } of METHODS) {
        const request = parseReconstructionRequest({
          source: { imageId: 'tuning' },
          matrix: { nx: n, ny: n },
          sampling: sampling(acceleration),
          method: spec,
        });
        const outcome = await runReconstruction(request, undefined, { loadImage: async () => reference });
        const image = outcome.images.reconstruction;
        lines.push(
          [
            slice.label,
            mask,
            acceleration,
            outcome.fraction.toFixed(4),
            label,
            outcome.info.rank ?? '',
            outcome.metrics.nrmse.toFixed(5),
            outcome.metrics.ssim.toFixed(5),
            ssim(image, reference, { mask: inObject }).toFixed(5),
            ssim(image, reference, { mask: inBackground }).toFixed(5),
          ].join(','),
        );
      }
    }
    writeFileSync(out, `${lines.join('\n')}\n`);
    console.log(`${slice.label} ${mask} done`);
  }
}
