// `npm run bench`: speed figures, printed (never asserted: timings depend on the machine).
// Each part of the system owns its bench file.

const sections = [
  { title: 'Engine (perception, snapping, orientation)', file: './engine.bench.ts', run: 'runEngineBench' },
  { title: 'Command line (pointfold snap)', file: './cli.bench.ts', run: 'runCliBench' },
  { title: 'Batches (API upload → worker → results)', file: './batch.bench.ts', run: 'runBatchBench' },
];

let failures = 0;
for (const section of sections) {
  const url = new URL(section.file, import.meta.url);
  process.stdout.write(`\n== ${section.title} ==\n`);
  const mod = (await import(url.href)) as Record<string, unknown>;
  const run = mod[section.run];
  if (typeof run !== 'function') throw new Error(`tests/bench/${section.file.slice(2)} has no export ${section.run}`);
  const started = performance.now();
  try {
    await (run as () => Promise<void> | void)();
    process.stdout.write(`(section took ${((performance.now() - started) / 1000).toFixed(1)} s)\n`);
  } catch (err) {
    failures++;
    process.stdout.write(`✗ ${section.run} failed: ${(err as Error).message}\n`);
  }
}
process.exit(failures > 0 ? 1 : 0);
