// Fallback when GNU time is missing: runs the compiled CLI in this process and writes
// "wall maxRSS(bytes) user sys" to the file named first when the process exits.
//   node bench/rusageWrapper.mjs OUTFILE datlas-args...
import { writeFileSync } from 'node:fs';

const [out, ...args] = process.argv.slice(2);
const t0 = performance.now();
process.on('exit', () => {
  const u = process.resourceUsage();
  writeFileSync(out, `${((performance.now() - t0) / 1000).toFixed(3)} ${u.maxRSS * 1024} ${u.userCPUTime / 1e6} ${u.systemCPUTime / 1e6}\n`);
});
const { main } = await import('../dist/src/cli/main.js');
process.exitCode = await main(args);
