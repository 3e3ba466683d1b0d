/**
 * Summarises V8 .cpuprofile files (node --cpu-prof; one per thread): self time per function,
 * largest first, so the bench can say where a slow step spends its time.
 *   node --import tsx bench/profileSummary.ts DIR [top]
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
}
interface CpuProfile {
  nodes: ProfileNode[];
  startTime: number;
  endTime: number;
  samples?: number[];
  timeDeltas?: number[];
}

export interface SelfTime {
  fn: string;
  where: string;
  ms: number;
  share: number;
}

/** Short location: the path from src/ or node_modules/<pkg>, else the file name. */
function shortUrl(url: string, line: number): string {
  if (!url) return '(native)';
  const m = /(?:\/(src|bench)\/.*|node_modules\/(?:@[^/]+\/)?[^/]+)/.exec(url);
  const base = m ? m[0].replace(/^\//, '') : url.replace(/^.*\//, '');
  return `${base}:${line + 1}`;
}

/** Self time per function over every profile in dir (threads summed), top `top` rows. */
export function summarizeProfiles(dir: string, top = 15): { totalMs: number; threads: number; rows: SelfTime[] } {
  const files = readdirSync(dir).filter((f) => f.endsWith('.cpuprofile'));
  const byKey = new Map<string, SelfTime>();
  let totalMs = 0;
  for (const f of files) {
    const p = JSON.parse(readFileSync(join(dir, f), 'utf8')) as CpuProfile;
    const self = new Map<number, number>();
    if (p.samples && p.timeDeltas) {
      // Each delta is the time since the previous sample: charge it to the sample that ends it.
      for (let i = 0; i < p.samples.length; i++) self.set(p.samples[i], (self.get(p.samples[i]) ?? 0) + (p.timeDeltas[i] ?? 0) / 1000);
    }
    for (const n of p.nodes) {
      const ms = self.get(n.id) ?? 0;
      if (ms === 0) continue;
      const fn = n.callFrame.functionName || '(anonymous)';
      const where = shortUrl(n.callFrame.url, n.callFrame.lineNumber);
      const key = `${fn}@${where}`;
      const e = byKey.get(key) ?? { fn, where, ms: 0, share: 0 };
      e.ms += ms;
      byKey.set(key, e);
      totalMs += ms;
    }
  }
  const rows = [...byKey.values()].sort((a, b) => b.ms - a.ms).slice(0, top);
  for (const r of rows) r.share = totalMs > 0 ? r.ms / totalMs : 0;
  return { totalMs, threads: files.length, rows };
}

export function formatSummary(s: ReturnType<typeof summarizeProfiles>): string {
  const lines = [`  ${s.threads} thread profile(s), ${(s.totalMs / 1000).toFixed(2)} s sampled; top self time:`];
  for (const r of s.rows) lines.push(`  ${(r.ms / 1000).toFixed(3).padStart(7)} s ${(100 * r.share).toFixed(1).padStart(5)}%  ${r.fn}  ${r.where}`);
  return lines.join('\n');
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const dir = process.argv[2];
  if (!dir) {
    console.error('usage: node --import tsx bench/profileSummary.ts DIR [top]');
    process.exit(2);
  }
  console.log(formatSummary(summarizeProfiles(dir, Number(process.argv[3] ?? 20))));
}
