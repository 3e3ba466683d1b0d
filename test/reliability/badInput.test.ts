import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { tableFromArrays, tableToIPC } from '@uwdata/flechette';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { tableToRows } from '../../src/store/tableFromRows.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import { checkStore } from './storeCheck.js';

// Bad input, format by format: each case has a defined outcome (rows accepted, rejected with
// file, line, field and reason, pending, or a note) and every run keeps the accounting identity
// read == accepted + duplicates + rejected + pending (DESIGN.md §4, §6). README "Bad input"
// lists the same outcomes.
const H = 'run,width,epoch,n,seed,test_error,train_error';
const row = (run: string, epoch: number, te = '0.5') => `${run},8,${epoch},1000,1,${te},0.1`;

interface Case {
  name: string;
  file: string;
  body: string | Uint8Array;
  accepted: number;
  rejected?: number;
  pending?: number;
  duplicates?: number;
  /** [line, field, reason] of each rejection, in order (line 0: the whole file). */
  rejects?: [number, string, RegExp][];
  notes?: RegExp[];
  rows?: (rows: RowRecord[]) => void;
}

const garbage = Uint8Array.from({ length: 600 }, (_, i) => (i * 7919 + 13) % 256);
const arrowBytes = tableToIPC(tableFromArrays({ width: new Float64Array([8, 16]), epoch: new Float64Array([1, 1]), n: new Float64Array([100, 100]), test_error: new Float64Array([0.4, NaN]) }), { format: 'file' })!;

const CASES: Case[] = [
  // ── CSV / TSV structure
  { name: 'unbalanced quote mid-file: that row rejected, reading resumes', file: 'q.csv', body: `${H}\n${row('a', 1)}\n"b,8,2,1000,1,0.4,0.1\n${row('a', 3)}\n`, accepted: 2, rejects: [[3, 'run', /unbalanced quote: the quoted field opened on line 3/]] },
  { name: 'unbalanced quote on a last line still being written: pending', file: 'q2.csv', body: `${H}\n${row('a', 1)}\na,8,2,1000,1,"0.4`, accepted: 1, pending: 1 },
  { name: 'unbalanced quote in the header: the file is refused', file: 'q3.csv', body: `"run,width\n${row('a', 1)}\n`, accepted: 0, rejects: [[0, '', /unbalanced quote in the header/]] },
  { name: 'ragged rows: short names the first missing field, long ones the count', file: 'ragged.csv', body: `${H}\n${row('a', 1)}\na,8,2,1000,1,0.4\n${row('a', 3)},9\n`, accepted: 1, rejects: [[3, 'train_error', /expected 7 fields \(as in the header\), got 6/], [4, '', /expected 7 fields \(as in the header\), got 8/]] },
  { name: 'ragged TSV row', file: 'r.tsv', body: `width\tepoch\tn\ttest_error\n8\t1\t100\t0.5\n8\t2\t100\n`, accepted: 1, rejects: [[3, 'test_error', /expected 4 fields/]] },
  { name: 'ragged whitespace-text row', file: 'r.txt', body: 'width epoch n test_error\n8 1 100 0.5\n8 2 100\n', accepted: 1, rejects: [[3, 'test_error', /expected 4 fields/]] },
  { name: 'CRLF line ends and a byte-order mark', file: 'crlf.csv', body: `\uFEFF${H}\r\n${row('a', 1)}\r\n${row('a', 2)}\r\n`, accepted: 2 },
  { name: 'blank lines between rows are not rows', file: 'blank.csv', body: `${H}\n\n${row('a', 1)}\n\n\n${row('a', 2)}\n`, accepted: 2 },
  // ── encodings and bytes
  { name: 'binary garbage named .csv: refused in one line', file: 'garbage.csv', body: garbage, accepted: 0, rejects: [[0, '', /not a text log: \d+ of its first 600 bytes are control bytes/]] },
  { name: 'binary garbage named .log (format sniffed)', file: 'garbage.log', body: garbage, accepted: 0, rejects: [[0, '', /not a text log/]] },
  { name: 'gzip-compressed log', file: 'log.csv', body: Uint8Array.from([0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 0, 3, 1, 2, 3]), accepted: 0, rejects: [[0, '', /gzip-compressed file/]] },
  { name: 'UTF-16 LE with byte-order mark', file: 'u16le.csv', body: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(`${H}\n${row('é', 1)}\n`, 'utf16le')]), accepted: 1, rows: (r) => expect(r[0].run).toBe('é') },
  { name: 'UTF-16 BE with byte-order mark', file: 'u16be.csv', body: Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(`${H}\n${row('a', 1)}\n`, 'utf16le').swap16()]), accepted: 1 },
  { name: 'UTF-16 LE without byte-order mark (guessed, noted)', file: 'u16nobom.csv', body: Buffer.from(`${H}\n${row('a', 1)}\n`, 'utf16le'), accepted: 1, notes: [/not UTF-8; read as UTF-16LE \(no byte-order mark\)/] },
  { name: 'Latin-1 text (not UTF-8): read as Latin-1, noted', file: 'latin1.csv', body: Buffer.from(`${H},optimizer\n${row('ä', 1)},Adam-é\n`, 'latin1'), accepted: 1, notes: [/not UTF-8; read as Latin-1/], rows: (r) => expect([r[0].run, r[0].condition]).toEqual(['ä', 'optimizer=Adam-é']) },
  // ── empty and header-only
  { name: 'empty CSV', file: 'empty.csv', body: '', accepted: 0, notes: [/nothing to read \(empty file/] },
  { name: 'empty JSON Lines', file: 'empty.jsonl', body: '', accepted: 0, notes: [/nothing to read/] },
  { name: 'empty JSON (whitespace only)', file: 'empty.json', body: '  \n', accepted: 0, notes: [/nothing to read/] },
  { name: 'empty Arrow file', file: 'empty.arrow', body: new Uint8Array(0), accepted: 0, notes: [/nothing to read/] },
  { name: 'header only', file: 'header.csv', body: `${H}\n`, accepted: 0, notes: [/header only, no rows yet/] },
  { name: 'header only, TSV', file: 'header.tsv', body: 'width\tepoch\tn\ttest_error\n', accepted: 0, notes: [/header only/] },
  { name: 'header still being written (no line end)', file: 'half.csv', body: 'run,width,ep', accepted: 0, notes: [/first line is not complete yet/] },
  { name: 'JSON array with no records', file: 'none.json', body: '[]', accepted: 0, notes: [/nothing to read|header only/] },
  // ── joined logs
  { name: 'header repeated mid-file (logs joined end to end): skipped, noted', file: 'joined.csv', body: `${H}\n${row('a', 1)}\n${H}\n${row('b', 1)}\n${H}\n${row('c', 1)}\n`, accepted: 3, notes: [/line 3 repeats the header \(logs joined end to end\?\); 2 such lines skipped/] },
  { name: 'a different header mid-file fences the rows below it', file: 'joined2.csv', body: `${H}\n${row('a', 1)}\nepoch,width,n,test_error\n1,8,1000,0.5\n2,8,1000,0.4\n${H}\n${row('c', 1)}\n`, accepted: 2, rejects: [[3, '', /a header with different columns/], [4, '', /below a different header \(line 3\)/], [5, '', /below a different header/]], notes: [/repeats the header/] },
  // ── huge lines
  { name: 'a 4 MB line with an extra field', file: 'huge.csv', body: `${H}\n${row('a', 1)},${'x'.repeat(4_000_000)}\n${row('a', 2)}\n`, accepted: 1, rejects: [[2, '', /expected 7 fields/]] },
  // ── limits (ReadLimits; README "Limits"): each names line, field and limit; the rest is read
  { name: 'a 4 MB run id: rejected by the text limit, the next row read', file: 'hugeid.csv', body: `${H}\n${row('r'.repeat(4_000_000), 1)}\n${row('a', 1)}\n`, accepted: 1, rejects: [[2, 'run', /text of 4,000,000 characters, over the limit of 65,536 \(raise it with --max-text\)/]] },
  { name: 'a 1 MB column name: the column left out (noted, clipped), the rows read', file: 'hugename.csv', body: `width,epoch,n,test_error,${'c'.repeat(1_000_000)}\n8,1,100,0.5,abc\n8,2,100,0.4,abc\n`, accepted: 2, notes: [/the name of column 5 is 1,000,000 characters, over the limit of 65,536 \(--max-text\); column left out/], rows: (r) => expect(r[0].condition).toBe('') },
  { name: 'a 3 MB string in a JSON line: that line rejected by the text limit', file: 'huge.jsonl', body: `{"width":8,"epoch":1,"n":100,"test_error":0.5,"blob":"${'z'.repeat(3_000_000)}"}\n{"width":8,"epoch":2,"n":100,"test_error":0.4}\n`, accepted: 1, rejects: [[1, 'blob', /text of 3,000,000 characters, over the limit of 65,536/]] },
  { name: 'a CSV row of 100,000 fields: rejected at the field limit, the rows after it read', file: 'wide.csv', body: `${H}\n${row('a', 1)}\n${'0.5,'.repeat(100_000)}\n${row('a', 2)}\n`, accepted: 2, rejects: [[3, '', /more than 10,000 fields, the limit \(raise it with --max-fields\)/]] },
  { name: 'a 9 MB CSV line without a delimiter: rejected at the line limit, the rows after it read', file: 'long.csv', body: `${H}\n${'x'.repeat(9_000_000)}\n${row('a', 2)}\n`, accepted: 1, rejects: [[2, '', /line longer than the limit of 8,388,608 characters \(raise it with --max-line\)/]] },
  { name: 'a 9 MB quoted field holding line breaks: rejected, line numbers after it still right', file: 'longq.csv', body: `${H}\n${row('a', 1)}\n"${'x\n'.repeat(4_500_000)}",8,1,100,1,0.5,0.1\n${row('a', 2)}\n`, accepted: 2, rejects: [[3, '', /line longer than the limit/]], rows: (r) => expect(r.map((x) => x.source_line)).toEqual([2, 4_500_004]) },
  { name: 'a 10 MB quoted field of doubled quotes: rejected at the line limit (no value built), the next row read', file: 'quotes.csv', body: `${H}\n"${'""'.repeat(5_000_000)}",8,1,1000,1,0.5,0.1\n${row('a', 2)}\n`, accepted: 1, rejects: [[2, '', /line longer than the limit/]] },
  { name: 'a header of 20,000 fields: the file refused naming line 1 and the limit', file: 'wideheader.csv', body: `${Array.from({ length: 20_000 }, (_, k) => `c${k}`).join(',')}\n1,2\n`, accepted: 0, rejects: [[0, '', /line 1 \(the header\) has more than 10,000 fields, the limit \(raise it with --max-fields\)/]] },
  { name: 'a whitespace-text line of 9 MB: rejected, the rest read', file: 'long.txt', body: `width epoch n test_error\n8 1 100 0.5\n${'y'.repeat(9_000_000)}\n8 2 100 0.4\n`, accepted: 2, rejects: [[3, '', /line longer than the limit of 8,388,608/]] },
  { name: 'a JSON line of 9 MB: rejected unread, the rest read', file: 'long.jsonl', body: `{"width":8,"epoch":1,"n":100,"test_error":0.5}\n{"width":8,"pad":[${'0,'.repeat(4_500_000)}0]}\n{"width":8,"epoch":2,"n":100,"test_error":0.4}\n`, accepted: 2, rejects: [[2, '', /line longer than the limit/]] },
  { name: 'a JSON line of 20,000 keys: rejected at the field limit', file: 'wide.jsonl', body: `{${Array.from({ length: 20_000 }, (_, k) => `"k${k}":1`).join(',')}}\n{"width":8,"epoch":2,"n":100,"test_error":0.4}\n`, accepted: 1, rejects: [[1, '', /more than 10,000 fields/]] },
  { name: 'a JSON line nested 100,000 levels deep: that line rejected, the next read', file: 'deep.jsonl', body: `{"width":8,"epoch":1,"n":100,"test_error":0.5}\n${'{"a":'.repeat(100_000)}1${'}'.repeat(100_000)}\n{"width":8,"epoch":2,"n":100,"test_error":0.4}\n`, accepted: 2, rejects: [[2, '', /nested more than 64 levels deep/]] },
  { name: 'a deep array in JSON Lines: rejected as too deep (not "no width column")', file: 'deeparr.jsonl', body: `${'['.repeat(100_000)}${']'.repeat(100_000)}\n{"width":8,"epoch":2,"n":100,"test_error":0.4}\n`, accepted: 1, rejects: [[1, '', /nested more than 64 levels deep/]] },
  { name: 'a JSON document nested 100,000 levels deep: refused naming its line', file: 'deep.json', body: `[\n{"width":8,"epoch":1,"n":100,"test_error":0.5},\n${'['.repeat(100_000)}${']'.repeat(100_000)}\n]\n`, accepted: 0, rejects: [[0, '', /at line 3: nested more than 64 levels deep/]] },
  { name: 'a 100 KB run name in a JSON document: that record rejected by the text limit', file: 'longname.json', body: `[{"run":"${'n'.repeat(100_000)}","width":8,"epoch":1,"n":100,"test_error":0.5},{"run":"b","width":8,"epoch":1,"n":100,"test_error":0.4}]`, accepted: 1, rejects: [[1, 'run', /text of 100,000 characters, over the limit of 65,536/]] },
  { name: 'terminal escape sequences in run and condition names: stored as given', file: 'esc.csv', body: `run,width,epoch,n,test_error,opt\n\u001b[31mred\u001b]0;title\u0007,8,1,100,0.5,\u001b[2Jx\n${Array.from({ length: 20 }, (_, e) => `plain,8,${e + 2},100,0.5,sgd`).join('\n')}\n`, accepted: 21, rows: (r) => expect([r[0].run, r[0].condition]).toEqual(['\u001b[31mred\u001b]0;title\u0007', 'opt=\u001b[2Jx']) },
  // ── numbers written for people
  { name: 'thousands separators ("4,000") read, noted', file: 'thousands.csv', body: 'width,epoch,n,test_error\n"1,024",1,"4,000",0.5\n8,2,"12,000",0.4\n', accepted: 2, notes: [/column 'width' has thousands separators \('1,024' read as 1024\)/, /column 'n' has thousands separators/], rows: (r) => expect(r.map((x) => [x.width, x.train_size])).toEqual([[1024, 4000], [8, 12000]]) },
  { name: 'percent signs ("12%") read as fractions', file: 'pct.csv', body: 'width,epoch,n,test_error\n8,1,100,12%\n8,2,100,9.5%\n', accepted: 2, rows: (r) => expect(r.map((x) => x.test_error)).toEqual([0.12, 0.095]) },
  { name: 'a unit after a number ("4000 samples"): rejected with a hint', file: 'units.csv', body: 'width,epoch,n,test_error\n8,1,4000 samples,0.5\n8,2,4000,0.4\n', accepted: 1, rejects: [[2, 'n', /not a number: '4000 samples' \(a unit 'samples'\? write the bare number\)/]] },
  { name: 'semicolon-separated export: read; a decimal comma rejected with a hint', file: 'semi.csv', body: 'width;epoch;n;test_error\n8;1;100;0,5\n8;2;100;0.4\n', accepted: 1, rejects: [[2, 'test_error', /not a number: '0,5' \(a decimal comma\? write 0.5\)/]] },
  { name: 'a quoted decimal comma in a CSV', file: 'comma2.csv', body: 'width,epoch,n,test_error\n8,1,100,"0,5"\n8,2,100,0.4\n', accepted: 1, rejects: [[2, 'test_error', /a decimal comma\? write 0\.5/]] },
  { name: 'an unquoted "1,000" splits the row: field count', file: 'split.csv', body: 'width,epoch,n,test_error\n8,1,1,000,0.5\n', accepted: 0, rejects: [[2, '', /expected 4 fields \(as in the header\), got 5/]] },
  { name: 'text in a number column', file: 'text.csv', body: 'width,epoch,n,test_error\neight,1,100,0.5\n8,1,100,0.5\n', accepted: 1, rejects: [[2, 'width', /not a number: 'eight'/]] },
  // ── JSON Lines and JSON
  { name: 'JSON Lines: broken line, array, string, garbage; each one row', file: 'bad.jsonl', body: '{"width":8,"epoch":1,"n":100,"test_error":0.5}\n{"width":8,"epoch":2,\n[1,2]\n"str"\n\u0001\u0002garbage\n{"width":8,"epoch":3,"n":100,"test_error":NaN}\n', accepted: 2, rejects: [[2, '', /not valid JSON/], [3, '', /not a JSON object/], [4, '', /not a JSON object/], [5, '', /not valid JSON/]], rows: (r) => expect(r[1].status).toBe('diverged') },
  { name: 'JSON Lines: last line still being written', file: 'grow.jsonl', body: '{"width":8,"epoch":1,"n":100,"test_error":0.5}\n{"width":8,"epo', accepted: 1, pending: 1 },
  { name: 'JSON array cut short: refused with its line', file: 'cut.json', body: '[\n{"width":8,"epoch":1,"n":100,"test_error":0.5},\n{"width":8,"epoch":2,"n":100', accepted: 0, rejects: [[0, '', /not valid JSON/]] },
  { name: 'JSON with a bad token: line named', file: 'tok.json', body: '[\n{"width":8,"epoch":1,"n":100,"test_error":0.5},\n{"width": nope}\n]', accepted: 0, rejects: [[0, '', /not valid JSON/]] },
  // ── Arrow
  { name: 'Arrow file cut short: refused in one line', file: 'cut.arrow', body: arrowBytes.subarray(0, 100), accepted: 0, rejects: [[0, '', /not a readable Arrow IPC file/]] },
  { name: 'Arrow file with NaN test error: diverged', file: 'ok.arrow', body: arrowBytes, accepted: 2, rows: (r) => expect(r.map((x) => x.status)).toEqual(['ok', 'diverged']) },
  // ── values
  { name: 'NaN, nan, inf, -Infinity test error: kept as diverged', file: 'nonfinite.csv', body: `${H}\n${row('a', 1, 'NaN')}\n${row('b', 1, 'nan')}\n${row('c', 1, 'inf')}\n${row('d', 1, '-Infinity')}\n`, accepted: 4, rows: (r) => expect(r.every((x) => x.status === 'diverged' && Number.isNaN(x.test_error))).toBe(true) },
  { name: 'negative and over-1 errors: rejected; the column stays fractions (noted)', file: 'range.csv', body: `${H}\n${row('a', 1, '-0.1')}\n${row('a', 2, '1.5')}\n${row('a', 3, '0.5')}\n${row('a', 4, '0.4')}\n${row('a', 5, '0.3')}\n`, accepted: 3, rejects: [[2, 'test_error', /test_error must be between 0 and 1 \(or a percent\), got -0.1/], [3, 'test_error', /got 1.5/]], notes: [/read as fractions; 1 of 5 values above 1 are rejected \(if the column is in percent, add --scale test_error=percent\)/], rows: (r) => expect(r.map((x) => x.test_error)).toEqual([0.5, 0.4, 0.3]) },
  { name: 'a column in percent (most values above 1): divided by 100, noted', file: 'percent.csv', body: `${H}\n${row('a', 1, '45')}\n${row('a', 2, '30')}\n${row('a', 3, '0.9')}\n`, accepted: 3, notes: [/read as percent/], rows: (r) => expect(r.map((x) => +x.test_error.toFixed(12))).toEqual([0.45, 0.3, 0.009]) },
  { name: 'a percent name ("Test Err (%)") with few values above 1: still percent', file: 'pctname.csv', body: 'width,epoch,n,Test Err (%)\n8,1,100,45\n8,2,100,0.9\n8,3,100,0.5\n8,4,100,0.4\n8,5,100,0.3\n', accepted: 5, notes: [/column 'Test Err \(%\)' read as percent/], rows: (r) => expect(+r[0].test_error.toFixed(12)).toBe(0.45) },
  { name: 'negative loss: rejected', file: 'loss.csv', body: 'width,epoch,n,test_loss\n8,1,100,-2\n8,2,100,0.3\n', accepted: 1, rejects: [[2, 'test_loss', /test_loss must be >= 0, got -2/]] },
  { name: 'accuracy column: 1 − accuracy', file: 'acc.csv', body: 'width,epoch,n,test_acc\n8,1,100,0.9\n8,2,100,0.75\n', accepted: 2, rows: (r) => expect(r.map((x) => +x.test_error.toFixed(12))).toEqual([0.1, 0.25]) },
  { name: 'accuracy logged under an error name: kept, noted (it rises over training)', file: 'accaserr.csv', body: `${H}\n${[1, 2, 4, 8].map((e, i) => row('a', e, String(0.1 + 0.25 * i))).join('\n')}\n${[1, 2, 4, 8].map((e, i) => row('b', e, String(0.12 + 0.25 * i))).join('\n')}\n`, accepted: 8, notes: [/column 'test_error' \(read as test_error\) rises by more than 0.3 over training in 2 of 2 runs; if it is an accuracy, map it with --map test_accuracy=test_error/] },
  { name: 'error logged under an accuracy name: noted the other way', file: 'erraacc.csv', body: `width,epoch,n,run,accuracy\n${[1, 2, 4, 8].map((e, i) => `8,${e},100,a,${(0.9 - 0.25 * i).toFixed(2)}`).join('\n')}\n`, accepted: 4, notes: [/column 'accuracy' \(read as test_error\) rises .*if it is an error, map it with --map test_error=accuracy/] },
  { name: 'width 0 and negative width: rejected', file: 'width0.csv', body: `run,width,epoch,n,test_error\na,0,1,100,0.5\nb,-4,1,100,0.5\nc,8,1,100,0.5\n`, accepted: 1, rejects: [[2, 'width', /width must be > 0, got 0/], [3, 'width', /width must be > 0, got -4/]] },
  { name: 'width 1e308 or 5e-324, epochs 1e300, train size 1e20: rejected as implausible (they overflowed the map)', file: 'absurd.csv', body: 'run,width,epoch,n,test_error\na,1e308,1,100,0.5\nb,5e-324,1,100,0.5\nc,8,1e300,100,0.5\nd,8,1,1e20,0.5\ne,1e15,1,100,0.5\n', accepted: 1, rejects: [[2, 'width', /width 1e308 is outside the plausible range 1e-9 to 1e15 \(a unit mix-up or a corrupt log\?\)/], [3, 'width', /width 5e-324 is outside/], [4, 'epoch', /epochs 1e300 is outside the plausible range 0 to 1e12/], [5, 'n', /train_size 1e20 is outside/]] },
  { name: 'fractional train size: rejected', file: 'n.csv', body: 'width,epoch,n,test_error\n8,1,100.5,0.5\n', accepted: 0, rejects: [[2, 'n', /train_size must be a whole number > 0, got 100.5/]] },
  { name: 'label noise above 1: rejected', file: 'noise.csv', body: 'width,epoch,n,label_noise,test_error\n8,1,100,1.5,0.5\n8,1,100,0.2,0.5\n16,1,100,0.2,0.5\n32,1,100,0,0.5\n64,1,100,0.1,0.5\n', accepted: 4, rejects: [[2, 'label_noise', /label_noise must be between 0 and 1/]] },
  { name: 'duplicate epoch in one run: equal = duplicate, different = conflict (later line kept)', file: 'dup.csv', body: `${H}\n${row('a', 1)}\n${row('a', 1)}\n${row('a', 1, '0.6')}\n`, accepted: 1, duplicates: 1, rejects: [[2, 'run', /conflict: run 'a' epoch 1 has different values in .*dup.csv line 4, which is newer and was kept/]], rows: (r) => expect(r[0].test_error).toBe(0.6) },
  { name: 'epochs going backwards (restarted job): noted, the later line wins repeated epochs', file: 'restart.csv', body: `${H}\n${row('a', 1, '0.5')}\n${row('a', 2, '0.4')}\n${row('a', 3, '0.35')}\n${row('a', 2, '0.41')}\n${row('a', 3, '0.33')}\n${row('a', 4, '0.3')}\n`, accepted: 4, rejects: [[3, 'run', /conflict/], [4, 'run', /conflict/]], notes: [/run 'a' goes back from epoch 3 to 2 at line 5 \(a restarted job\?\); for an epoch logged twice the later line is kept/], rows: (r) => expect(r.map((x) => [x.epochs, x.test_error])).toEqual([[1, 0.5], [2, 0.41], [3, 0.33], [4, 0.3]]) },
  { name: 'empty test error, train error present: kept as "not measured" (status ok)', file: 'notest.csv', body: `${H}\n${row('a', 1, '')}\n${row('a', 2, '0.4')}\n`, accepted: 2, rows: (r) => expect([Number.isNaN(r[0].test_error), r[0].train_error, r[0].status]).toEqual([true, 0.1, 'ok']) },
  { name: 'no metric at all in a row: rejected', file: 'nometric.csv', body: 'width,epoch,n,test_error,train_error\n8,1,100,,\n8,2,100,0.4,\n', accepted: 1, rejects: [[2, 'test_error', /no metric in this row/]] },
  { name: 'train and test logged on separate lines of one epoch: merged into one row', file: 'split.jsonl', body: '{"run":"a","width":8,"epoch":1,"n":100,"train_error":0.2}\n{"run":"a","width":8,"epoch":1,"n":100,"test_error":0.5}\n', accepted: 1, duplicates: 1, notes: [/1 row completed a row of the same run and epoch/], rows: (r) => expect([r[0].train_error, r[0].test_error]).toEqual([0.2, 0.5]) },
];

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-badinput-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe(`bad input: ${CASES.length} malformed inputs, each with a defined outcome`, () => {
  it.each(CASES.map((c, k) => [c.name, c, k] as const))('%s', async (_name, c, k) => {
    const folder = join(dir, `case${k}`);
    mkdirSync(folder);
    const path = join(folder, c.file);
    writeFileSync(path, c.body);
    const store = join(folder, 'store');
    const r = await ingestSources({ paths: [path], store });
    expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
    const rejects = c.rejects ?? [];
    expect({ accepted: r.accepted, rejected: r.rejected, pending: r.pending, duplicates: r.duplicates })
      .toEqual({ accepted: c.accepted, rejected: c.rejected ?? rejects.length, pending: c.pending ?? 0, duplicates: c.duplicates ?? 0 });
    const got = [...r.rejects].sort((a, b) => a.line - b.line);
    expect(got.map((x) => [x.source, x.line, x.field])).toEqual(rejects.map(([line, field]) => [path, line, field]));
    got.forEach((x, i) => expect(x.reason).toMatch(rejects[i][2]));
    for (const x of got) expect(x.reason).not.toContain('\n');
    for (const note of c.notes ?? []) expect(r.notes.some((n) => note.test(n)), `${note} in ${JSON.stringify(r.notes)}`).toBe(true);
    for (const n of r.notes) expect(n.length).toBeLessThan(400); // one line, huge names clipped
    const state = await checkStore(store);
    expect(state.rows).toBe(c.accepted);
    c.rows?.(tableToRows(state.table));
  });
});

describe('folders', () => {
  it('a symbolic link back up the tree is walked once', async () => {
    const root = join(dir, 'loop');
    mkdirSync(join(root, 'runs'), { recursive: true });
    writeFileSync(join(root, 'runs', 'a.csv'), `${H}\n${row('a', 1)}\n`);
    symlinkSync('..', join(root, 'runs', 'up'));
    const r = await ingestSources({ paths: [root], store: join(root, 'store') });
    expect({ sources: r.sources, accepted: r.accepted, duplicates: r.duplicates }).toEqual({ sources: 1, accepted: 1, duplicates: 0 });
  });

  it('link loops, dangling links, a named pipe, compressed and binary files: each skipped with a note (and in skippedSources), the valid files read', async () => {
    const root = join(dir, 'odd');
    mkdirSync(root, { recursive: true });
    writeFileSync(join(root, 'a.csv'), `${H}\n${row('a', 1)}\n`);
    writeFileSync(join(root, 'z.csv'), `${H}\n${row('z', 1)}\n`);
    symlinkSync('loop2.csv', join(root, 'loop1.csv'));
    symlinkSync('loop1.csv', join(root, 'loop2.csv'));
    symlinkSync('nowhere.csv', join(root, 'dangling.csv'));
    execFileSync('mkfifo', [join(root, 'pipe.csv')]);
    writeFileSync(join(root, 'log.csv.gz'), Uint8Array.from([0x1f, 0x8b, 8, 0]));
    writeFileSync(join(root, 'dump.bin'), Uint8Array.from([0, 1, 2, 3]));
    writeFileSync(join(root, 'README.md'), 'notes\n');
    const r = await ingestSources({ paths: [root], store: join(dir, 'odd-store') });
    expect({ sources: r.sources, accepted: r.accepted, rejected: r.rejected }).toEqual({ sources: 2, accepted: 2, rejected: 0 });
    const why = Object.fromEntries(r.skippedSources.map((x) => [x.path.slice(root.length + 1), x.reason]));
    expect(why).toEqual({
      'loop1.csv': expect.stringMatching(/symbolic link loop/),
      'loop2.csv': expect.stringMatching(/symbolic link loop/),
      'dangling.csv': expect.stringMatching(/symbolic link to 'nowhere.csv', which does not exist/),
      'pipe.csv': expect.stringMatching(/named pipe \(FIFO\), not a regular file/),
      'log.csv.gz': expect.stringMatching(/a .gz file \(compressed or binary\)/),
      'dump.bin': expect.stringMatching(/a .bin file/),
      'README.md': expect.stringMatching(/not a log format/),
    });
    for (const name of ['loop1.csv', 'loop2.csv', 'dangling.csv', 'pipe.csv', 'log.csv.gz', 'dump.bin']) expect(r.notes.some((n) => n.includes(join(root, name))), name).toBe(true);
    expect(r.notes.some((n) => /1 file of other types passed over.*README.md/.test(n))).toBe(true);
  });

  it('a named pipe or a link loop named directly: skipped with a note at once, never a wait; the other paths read', async () => {
    const root = join(dir, 'named');
    mkdirSync(root, { recursive: true });
    writeFileSync(join(root, 'a.csv'), `${H}\n${row('a', 1)}\n`);
    execFileSync('mkfifo', [join(root, 'fifo.csv')]);
    symlinkSync('self.csv', join(root, 'self.csv'));
    const r = await ingestSources({ paths: [join(root, 'fifo.csv'), join(root, 'self.csv'), join(root, 'a.csv')], store: join(dir, 'named-store') });
    expect({ sources: r.sources, accepted: r.accepted }).toEqual({ sources: 1, accepted: 1 });
    expect(r.skippedSources.map((x) => x.reason)).toEqual([expect.stringMatching(/symbolic link loop/), expect.stringMatching(/named pipe \(FIFO\): reading it could wait forever; pipe it in instead: datlas ingest - </)]);
    expect(r.notes.some((n) => /cannot open .*self.csv: a symbolic link loop/.test(n))).toBe(true);
  });

  it('run folders whose config nests 100 or 20,000 levels deep (block and flow YAML, JSON): refused as too deep, never a stack overflow', async () => {
    const root = join(dir, 'deepcfg');
    const configs: [string, string][] = [
      ['config.yaml', `a:\n${Array.from({ length: 100 }, (_, i) => `${' '.repeat(2 * (i + 1))}b:`).join('\n')} 1\n`],
      ['config.yaml', `a: ${'['.repeat(20_000)}${']'.repeat(20_000)}\n`],
      ['config.json', `{"a":${'['.repeat(20_000)}${']'.repeat(20_000)}}`],
    ];
    configs.forEach(([name, body], k) => {
      mkdirSync(join(root, `r${k}`), { recursive: true });
      writeFileSync(join(root, `r${k}`, name), body);
      writeFileSync(join(root, `r${k}`, 'metrics.csv'), 'epoch,width,n,test_error\n1,8,100,0.5\n');
    });
    mkdirSync(join(root, 'ok'), { recursive: true });
    writeFileSync(join(root, 'ok', 'config.json'), '{"width": 16, "n": 100}');
    writeFileSync(join(root, 'ok', 'metrics.csv'), 'epoch,test_error\n1,0.5\n');
    const r = await ingestSources({ paths: [root], store: join(root, 'store') });
    expect({ accepted: r.accepted, failed: r.failed }).toEqual({ accepted: 1, failed: 3 });
    for (const x of r.rejects) expect(x.reason).toBe('run directory config is not readable: nested more than 64 levels deep (objects or arrays inside one another), the limit');
  });

  it('a run folder with a broken config: one rejection naming the reason, other folders read', async () => {
    const root = join(dir, 'rundirs');
    mkdirSync(join(root, 'r1'), { recursive: true });
    mkdirSync(join(root, 'r2'), { recursive: true });
    writeFileSync(join(root, 'r1', 'config.json'), '{"width": 8, "n": 100');
    writeFileSync(join(root, 'r1', 'metrics.csv'), 'epoch,test_error\n1,0.5\n');
    writeFileSync(join(root, 'r2', 'config.json'), '{"width": 16, "n": 100}');
    writeFileSync(join(root, 'r2', 'metrics.csv'), 'epoch,test_error\n1,0.5\n2,0.4\n');
    const r = await ingestSources({ paths: [root], store: join(root, 'store') });
    expect({ accepted: r.accepted, rejected: r.rejected, failed: r.failed }).toEqual({ accepted: 2, rejected: 1, failed: 1 });
    expect(r.rejects[0].reason).toMatch(/run directory config is not readable/);
    expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
  });
});
