// The codes Beadroll knows, by the names the trade writes them.
import type { CodeId } from '@beadroll/rules';

export const codeNames: Record<CodeId, string> = {
  'asme-ix': 'ASME IX',
  'aws-d1.1': 'AWS D1.1',
  'api-1104': 'API 1104',
  'iso-9606-1': 'ISO 9606-1',
};
