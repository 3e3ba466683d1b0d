import { describe, expect, it } from 'vitest';
import { escapeHtml, jsonForScript, scriptForInline } from '../../src/report/escapeHtml.js';

describe('escapeHtml', () => {
  it('escapes the five HTML-special characters (HTML Living Standard §13.1.2: text and attribute values)', () => {
    expect(escapeHtml(`<img src=x onerror="alert('1')"> & more`)).toBe('&lt;img src=x onerror=&quot;alert(&#39;1&#39;)&quot;&gt; &amp; more');
  });
  it('leaves plain text alone', () => {
    expect(escapeHtml('width 64 · label_noise 0.2 ≈ n')).toBe('width 64 · label_noise 0.2 ≈ n');
  });
});

describe('jsonForScript', () => {
  it('cannot close its script element and round-trips through JSON.parse', () => {
    const value = { run: '</script><script>alert(1)</script>', c: '<!-- x -->', amp: 'a&b', ls: '\u2028' };
    const text = jsonForScript(value);
    expect(text).not.toMatch(/<\/script/i);
    expect(text).not.toContain('<!--');
    expect(JSON.parse(text)).toEqual(value);
  });
});

describe('scriptForInline', () => {
  it('breaks a literal </script inside library source', () => {
    expect(scriptForInline('var s = "</script>";')).toBe('var s = "<\\/script>";');
  });
});
