// Developer entry point: `npx tsx server/demo/cli.ts --out /tmp/demo --years 3 --step-minutes 5 [--seed S] [--end ISO] [--split year|quarter]`.
// `bin/osmia seed --demo` calls generateDemoPlant itself and then imports the files.
import { parseArgs } from 'node:util';

import { generateDemoPlant } from './generate.ts';

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      out: { type: 'string' },
      years: { type: 'string' },
      'step-minutes': { type: 'string' },
      seed: { type: 'string' },
      end: { type: 'string' },
      split: { type: 'string' },
    },
    strict: true,
  });
  if (!values.out) throw new Error('--out FOLDER is required');
  const number = (flag: string, text: string | undefined) => {
    if (text === undefined) return undefined;
    const n = Number(text);
    if (!Number.isFinite(n)) throw new Error(`${flag} must be a number, got "${text}"`);
    return n;
  };
  const split = values.split;
  if (split !== undefined && split !== 'year' && split !== 'quarter') throw new Error('--split must be year or quarter');
  const started = performance.now();
  const manifest = await generateDemoPlant({
    outDir: values.out,
    years: number('--years', values.years),
    stepMinutes: number('--step-minutes', values['step-minutes']),
    seed: values.seed,
    end: values.end,
    historianSplit: split,
  });
  const seconds = (performance.now() - started) / 1000;
  const mb = (bytes: number) => (bytes / 1e6).toFixed(1);
  for (const f of manifest.files) console.log(`${f.file.padEnd(24)} ${String(f.rows).padStart(10)} rows ${mb(f.bytes).padStart(8)} MB`);
  const total = manifest.files.reduce((s, f) => s + f.bytes, 0);
  console.log(`${manifest.site.code} ${manifest.options.start} → ${manifest.options.end}, step ${manifest.options.stepMinutes} min: ${mb(total)} MB in ${seconds.toFixed(1)} s`);
}

main().catch((error: unknown) => {
  console.error(`Error: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
});
