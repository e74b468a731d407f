// Status is always shown three ways at once: colour, word and icon, so it reads in greyscale too.
import type { ComponentType, SVGProps } from 'react';
import { AlertIcon, BanIcon, CheckCircleIcon, ClockIcon, MailIcon, MinusCircleIcon } from './icons';

export type Tone = 'good' | 'warn' | 'bad' | 'neutral' | 'info';

const toneClasses: Record<Tone, string> = {
  good: 'bg-emerald-50 text-emerald-800 ring-emerald-600/25',
  warn: 'bg-amber-50 text-amber-900 ring-amber-600/30',
  bad: 'bg-red-50 text-red-800 ring-red-600/25',
  neutral: 'bg-stone-100 text-stone-700 ring-stone-500/25',
  info: 'bg-accent-50 text-accent-800 ring-accent-600/25',
};

interface StatusDef {
  label: string;
  tone: Tone;
  icon: ComponentType<SVGProps<SVGSVGElement>>;
}

/** Every status word Beadroll shows, with its colour and icon. */
export const statuses = {
  // a welder's employment
  'welder.active': { label: 'Active', tone: 'good', icon: CheckCircleIcon },
  'welder.left': { label: 'Left', tone: 'neutral', icon: MinusCircleIcon },
  // a person's sign-in
  'person.invited': { label: 'Invited', tone: 'info', icon: MailIcon },
  'person.active': { label: 'Active', tone: 'good', icon: CheckCircleIcon },
  'person.deactivated': { label: 'Deactivated', tone: 'neutral', icon: BanIcon },
  // a shop
  'shop.active': { label: 'Active', tone: 'good', icon: CheckCircleIcon },
  'shop.inactive': { label: 'Inactive', tone: 'neutral', icon: MinusCircleIcon },
  // a qualification
  'qualification.current': { label: 'Current', tone: 'good', icon: CheckCircleIcon },
  'qualification.lapsing': { label: 'Lapsing', tone: 'warn', icon: ClockIcon },
  'qualification.lapsed': { label: 'Lapsed', tone: 'bad', icon: AlertIcon },
  'qualification.revoked': { label: 'Revoked', tone: 'bad', icon: BanIcon },
  'qualification.superseded': { label: 'Superseded', tone: 'neutral', icon: MinusCircleIcon },
  // the verdict on a test coupon (visual and examination together)
  'coupon.accept': { label: 'Accept', tone: 'good', icon: CheckCircleIcon },
  'coupon.reject': { label: 'Reject', tone: 'bad', icon: BanIcon },
  'coupon.replace-specimen': { label: 'Replace specimen', tone: 'warn', icon: AlertIcon },
  'coupon.incomplete': { label: 'Incomplete', tone: 'warn', icon: ClockIcon },
  // a WPS in the register
  'procedure.active': { label: 'Active', tone: 'good', icon: CheckCircleIcon },
  'procedure.superseded': { label: 'Superseded', tone: 'neutral', icon: MinusCircleIcon },
  // a production weld's check on entry
  'weld.within': { label: 'Within qualification', tone: 'good', icon: CheckCircleIcon },
  'weld.flagged': { label: 'Flagged · waiting for a disposition', tone: 'bad', icon: AlertIcon },
  'weld.dispositioned': { label: 'Flagged · dispositioned', tone: 'warn', icon: CheckCircleIcon },
} satisfies Record<string, StatusDef>;

export type StatusKey = keyof typeof statuses;

export function StatusChip({ status, label }: { status: StatusKey; label?: string }) {
  const def: StatusDef = statuses[status];
  const IconComponent = def.icon;
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ring-inset ${toneClasses[def.tone]}`}
      data-tone={def.tone}
    >
      <IconComponent className="size-3.5 shrink-0" />
      {label ?? def.label}
    </span>
  );
}
