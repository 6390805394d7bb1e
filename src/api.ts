/**
 * plumb's programmatic API: everything the CLI can do, as functions. The CLI is a thin shell over
 * this module; nothing here depends on the CLI.
 */
export { PlumbError, type ErrorCode } from './errors.js';
export type { Finding, FindingKind, Severity, SourceLocation } from './findings.js';
export type { ProgressEvent, ProgressSink } from './progress.js';
export { TermDictionary, TermKind, literalKey, literalParts, toNTriples } from './graph/terms.js';
export { GraphBuilder, graphFromKeys, type Graph, type Csr } from './graph/store.js';
export { VERSION } from './version.js';
