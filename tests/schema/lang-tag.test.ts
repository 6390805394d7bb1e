import { describe, expect, it } from 'vitest';
import { isWellFormedLanguageTag } from '../../src/schema/lang-tag.js';

describe('BCP 47 well-formedness', () => {
  it('accepts the example tags of RFC 5646 Appendix A', () => {
    // Source: RFC 5646 (BCP 47), Appendix A "Examples of Language Tags (Informative)".
    const valid = [
      'de', 'fr', 'ja', 'i-enochian', 'zh-Hant', 'zh-Hans', 'sr-Cyrl', 'sr-Latn', 'zh-cmn-Hans-CN', 'cmn-Hans-CN',
      'zh-yue-HK', 'yue-HK', 'zh-Hans-CN', 'sr-Latn-RS', 'sl-rozaj', 'sl-rozaj-biske', 'sl-nedis', 'de-CH-1901',
      'sl-IT-nedis', 'hy-Latn-IT-arevela', 'de-DE', 'en-US', 'es-419', 'de-CH-x-phonebk', 'az-Arab-x-AZE-derbend',
      'x-whatever', 'qaa-Qaaa-QM-x-southern', 'de-Qaaa', 'sr-Latn-QM', 'sr-Qaaa-RS', 'en-US-u-islamcal',
      'zh-CN-a-myext-x-private', 'en-a-myext-b-another',
    ];
    for (const tag of valid) expect(isWellFormedLanguageTag(tag), tag).toBe(true);
  });

  it('rejects the ill-formed examples of RFC 5646 Appendix A', () => {
    // Source: RFC 5646 Appendix A, "Some Invalid Tags": two region tags; a one-letter primary subtag.
    expect(isWellFormedLanguageTag('de-419-DE')).toBe(false);
    expect(isWellFormedLanguageTag('a-DE')).toBe(false);
    // The third listed there, ar-a-aaa-b-bbb-a-ccc, repeats a singleton: invalid but well-formed (§2.2.9).
    expect(isWellFormedLanguageTag('ar-a-aaa-b-bbb-a-ccc')).toBe(true);
  });

  it('rejects other shapes outside the §2.1 grammar', () => {
    // Source: RFC 5646 §2.1 ABNF (subtag lengths; a singleton needs a following subtag; x- needs one too).
    for (const tag of ['', 'e', 'abcdefghi', 'en-', '-en', 'en--US', 'en-US-', 'en-a', 'en-x', 'x', 'en_US', 'de-1', 'en-verylongvariant1'])
      expect(isWellFormedLanguageTag(tag), tag).toBe(false);
  });

  it('is case-insensitive (RFC 5646 §2.1.1)', () => {
    expect(isWellFormedLanguageTag('EN-us')).toBe(true);
    expect(isWellFormedLanguageTag('I-KLINGON')).toBe(true);
    // 5 to 8 letters is a well-formed (reserved) primary language subtag.
    expect(isWellFormedLanguageTag('english')).toBe(true);
  });
});
