/** At most `max` UTF-16 units of s (the database's count), cut between characters, never inside a pair. */
export function clipText(s: string, max: number): string {
  let out = '';
  for (const ch of s) {
    if (out.length + ch.length > max) break;
    out += ch;
  }
  return out;
}
