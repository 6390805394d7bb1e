/**
 * Well-formedness of language tags: the `Language-Tag` production of BCP 47 (RFC 5646 §2.1),
 * case-insensitive. Well-formed is a syntactic test; it does not look subtags up in the IANA registry
 * and does not reject repeated variants or singletons (those make a tag invalid, not ill-formed,
 * RFC 5646 §2.2.9).
 */

const ALNUM = '[a-z0-9]';
const LANGUAGE = '(?:[a-z]{2,3}(?:-[a-z]{3}){0,3}|[a-z]{4}|[a-z]{5,8})';
const SCRIPT = '[a-z]{4}';
const REGION = '(?:[a-z]{2}|[0-9]{3})';
const VARIANT = `(?:${ALNUM}{5,8}|[0-9]${ALNUM}{3})`;
const EXTENSION = `(?:[0-9a-wyz](?:-${ALNUM}{2,8})+)`;
const PRIVATE_USE = `(?:x(?:-${ALNUM}{1,8})+)`;
const LANGTAG = `${LANGUAGE}(?:-${SCRIPT})?(?:-${REGION})?(?:-${VARIANT})*(?:-${EXTENSION})*(?:-${PRIVATE_USE})?`;
/** RFC 5646 §2.1 `grandfathered`: irregular tags that do not fit the production, kept for compatibility. */
const IRREGULAR = [
  'en-gb-oed', 'i-ami', 'i-bnn', 'i-default', 'i-enochian', 'i-hak', 'i-klingon', 'i-lux', 'i-mingo',
  'i-navajo', 'i-pwn', 'i-tao', 'i-tay', 'i-tsu', 'sgn-be-fr', 'sgn-be-nl', 'sgn-ch-de',
].join('|');
/** RFC 5646 §2.1 `regular` grandfathered tags. */
const REGULAR = 'art-lojban|cel-gaulish|no-bok|no-nyn|zh-guoyu|zh-hakka|zh-min|zh-min-nan|zh-xiang';

const LANGUAGE_TAG = new RegExp(`^(?:${LANGTAG}|${PRIVATE_USE}|${IRREGULAR}|${REGULAR})$`, 'i');

export function isWellFormedLanguageTag(tag: string): boolean {
  return LANGUAGE_TAG.test(tag);
}
