import { general } from '../messages.js';
import { usageError } from '../UserError.js';

const NUMBER = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)([kMG]?)$/;
/** SI suffixes as the tool prints large numbers (formatNumber: 100k, 1M), read back. */
const SI: Record<string, number> = { '': 1, k: 1e3, M: 1e6, G: 1e9 };

/**
 * --at values into {name: value}: `--at width=64 --at label_noise=0.2` or `--at width=64,epochs=1000`.
 * Numbers become numbers (with the SI suffixes k, M, G the tool prints: epochs=1M), anything else
 * stays a string (condition names). A comma followed by
 * text without `=` stays inside the value, so a condition may contain commas.
 */
export function parseAt(values: string[] | undefined): Record<string, number | string> {
  const out: Record<string, number | string> = {};
  for (const raw of values ?? []) {
    for (const text of String(raw).split(/,(?=[^,=]+=)/)) {
      const eq = text.indexOf('=');
      const name = text.slice(0, eq).trim();
      const valueText = text.slice(eq + 1).trim();
      if (eq <= 0 || name === '' || valueText === '') throw usageError(general.badAt(text));
      const m = NUMBER.exec(valueText);
      // 1.5k * 1000 in binary floating point is 1500 exactly for such short decimals; round to 12 digits all the same.
      const value = m ? Number((Number(m[1]) * SI[m[2]]).toPrecision(12)) : valueText;
      if (name in out && out[name] !== value) throw usageError(general.atTwice(name, String(out[name]), String(value)));
      out[name] = value;
    }
  }
  return out;
}
