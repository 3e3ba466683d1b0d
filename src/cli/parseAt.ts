import { general } from '../messages.js';
import { usageError } from '../UserError.js';

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * --at values into {name: value}: `--at width=64 --at label_noise=0.2` or `--at width=64,epochs=1000`.
 * Numbers become numbers, anything else stays a string (condition names). A comma followed by
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
      const value = NUMBER.test(valueText) ? Number(valueText) : valueText;
      if (name in out && out[name] !== value) throw usageError(general.atTwice(name, String(out[name]), String(value)));
      out[name] = value;
    }
  }
  return out;
}
