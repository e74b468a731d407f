// Lengths as people type them in Beadroll's forms ('3/16', '1-1/4 in', '4 mm'), read with the rules
// package's parseLength so the browser and the server read the same text the same way.
import { implausibleLength, parseLength, RulesInputError, type LengthBounds, type ParsedLength } from '@beadroll/rules';

export const firstMessage = (error: RulesInputError): string => Object.values(error.fields)[0] ?? error.message;

export type LengthRead = { ok: true; length: ParsedLength } | { ok: false; error: string } | null;

/** A length as typed ('3/16', '1-1/4 in', '4 mm'); null when nothing is typed yet. With bounds, a size
 *  outside them (99999999, 0) is refused with the same message the API gives (packages/rules lengthBounds). */
export function readLength(text: string, { positive = false, bounds }: { positive?: boolean; bounds?: LengthBounds } = {}): LengthRead {
  if (text.trim() === '') return null;
  try {
    const length = parseLength(text);
    const implausible = bounds ? implausibleLength(length, bounds) : null;
    if (implausible) return { ok: false, error: implausible };
    if (positive && length.value <= 0) return { ok: false, error: 'Must be greater than zero' };
    return { ok: true, length };
  } catch (error) {
    if (error instanceof RulesInputError) return { ok: false, error: firstMessage(error) };
    throw error;
  }
}

