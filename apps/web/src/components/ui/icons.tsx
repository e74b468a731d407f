// Small line icons drawn for Beadroll. Decorative: the word beside each icon carries the meaning.
import type { SVGProps } from 'react';

type IconProps = SVGProps<SVGSVGElement>;

function Icon({ children, className = 'size-4', ...props }: IconProps) {
  return (
    <svg
      viewBox="0 0 20 20"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.8}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      className={className}
      {...props}
    >
      {children}
    </svg>
  );
}

export const CheckCircleIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="m6.8 10.2 2.2 2.2 4.2-4.6" />
  </Icon>
);
export const ClockIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M10 6v4.2l2.8 1.8" />
  </Icon>
);
export const AlertIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 3 2.5 16.5h15z" />
    <path d="M10 8.5v3.5M10 14.3v.2" />
  </Icon>
);
export const BanIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="m4.8 15.2 10.4-10.4" />
  </Icon>
);
export const MinusCircleIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M6.5 10h7" />
  </Icon>
);
export const MailIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2.5" y="4.5" width="15" height="11" rx="1.5" />
    <path d="m3 5.5 7 5.5 7-5.5" />
  </Icon>
);
export const SortIcon = ({ sorted, ...p }: IconProps & { sorted: 'asc' | 'desc' | false }) => (
  <Icon {...p}>
    <path d="m6.5 8 3.5-3.5L13.5 8" opacity={sorted === 'desc' ? 0.25 : 1} />
    <path d="m6.5 12 3.5 3.5 3.5-3.5" opacity={sorted === 'asc' ? 0.25 : 1} />
  </Icon>
);
export const SearchIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8.8" cy="8.8" r="5.3" />
    <path d="m13 13 4 4" />
  </Icon>
);
export const ChevronLeftIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="m12 4.5-5.5 5.5 5.5 5.5" />
  </Icon>
);
export const ChevronRightIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="m8 4.5 5.5 5.5L8 15.5" />
  </Icon>
);
export const PlusIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 4.5v11M4.5 10h11" />
  </Icon>
);
export const InfoIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M10 9v4.5M10 6.3v.2" />
  </Icon>
);
export const BeadIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 12c1.9-4 3.6-4 5 0s3.1 4 5 0 3.4-4 5 0" />
  </Icon>
);
