// The content hash of a signed snapshot: SHA-256 of its canonical JSON (RFC 8785, JSON
// Canonicalization Scheme: sorted keys, shortest number form), so the same content hashes the same
// after a round trip through PostgreSQL's jsonb, which does not keep key order.
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';

export function canonicalJson(value: unknown): string {
  const text = canonicalize(value);
  if (text === undefined) throw new Error('canonicalJson: value has no JSON form');
  return text;
}

export function contentHash(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value), 'utf8').digest('hex');
}
