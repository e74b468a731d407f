// How a weld's check reads on screens: a chip in words and icon (never colour alone).
import { weldCheckWords, type Weld } from '@beadroll/rules';
import { StatusChip } from '@/components/ui/status-chip';

export function WeldCheckChip({ weld }: { weld: Pick<Weld, 'flagged' | 'reviewStatus' | 'disposition'> }) {
  const status = !weld.flagged && !weld.disposition ? 'weld.within' : weld.disposition ? 'weld.dispositioned' : 'weld.flagged';
  return <StatusChip status={status} label={weldCheckWords(weld)} />;
}
