import { describe, expect, it } from 'vitest';
import { RetainedText } from '../../src/sources/retained.js';
import { countBreaks, type TextBatch } from '../../src/sources/text.js';

function batches(texts: string[]): TextBatch[] {
  let line = 1;
  return texts.map((text) => {
    const batch = { text, firstLine: line, breaks: countBreaks(text), problems: [] };
    line += batch.breaks;
    return batch;
  });
}

describe('RetainedText', () => {
  it('gives back any retained line and the text from any line on, across batches', () => {
    const r = new RetainedText();
    for (const b of batches(['a\nb\r\n', 'c\rd\n', 'e'])) r.push(b);
    expect([1, 2, 3, 4, 5, 6].map((n) => r.line(n))).toEqual(['a', 'b', 'c', 'd', 'e', '']);
    expect([...r.from(2)].join('')).toBe('b\r\nc\rd\ne');
    expect([...r.from(4)].join('')).toBe('d\ne');
    expect(r.find(2, (l) => l.startsWith('d'))).toBe(4);
    expect(r.find(5, (l) => l === 'x')).toBe(-1);
  });

  it('forgets batches before a line and beyond its size limit, but never the newest', () => {
    const r = new RetainedText(6);
    for (const b of batches(['aa\n', 'bb\n', 'cc\n', 'dd\n'])) r.push(b);
    r.dropBefore(2);
    // Line 1 is gone because it ends before line 2; the limit of 6 characters keeps the last two batches.
    expect([...r.from(1)].join('')).toBe('cc\ndd\n');
    r.dropBefore(100);
    expect([...r.from(1)].join('')).toBe('dd\n');
  });
});
