import { type SVGProps } from 'react';

// Scorecourt's small set of line icons, drawn on a 20×20 grid. They are decoration beside a word
// (aria-hidden), never the only carrier of meaning.

type IconProps = SVGProps<SVGSVGElement>;

function Icon({ children, className, ...props }: IconProps) {
  return (
    <svg
      viewBox="0 0 20 20"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.75}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      className={className ?? 'size-4'}
      {...props}
    >
      {children}
    </svg>
  );
}

export const InfoIcon = (props: IconProps) => (
  <Icon {...props}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M10 9v5" />
    <path d="M10 6.1v.1" strokeWidth={2.25} />
  </Icon>
);

export const CautionIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M10 2.8 18 16.5H2z" />
    <path d="M10 8v4" />
    <path d="M10 14.3v.1" strokeWidth={2.25} />
  </Icon>
);

export const ErrorIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M6.9 2.5h6.2l4.4 4.4v6.2l-4.4 4.4H6.9l-4.4-4.4V6.9z" />
    <path d="m7.5 7.5 5 5M12.5 7.5l-5 5" />
  </Icon>
);

export const CheckIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="m4 10.5 4 4 8-9" />
  </Icon>
);

export const CheckCircleIcon = (props: IconProps) => (
  <Icon {...props}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="m6.5 10.3 2.4 2.4 4.6-5.2" />
  </Icon>
);

export const CrossIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="m5 5 10 10M15 5 5 15" />
  </Icon>
);

export const DotIcon = (props: IconProps) => (
  <Icon {...props}>
    <circle cx="10" cy="10" r="3" fill="currentColor" stroke="none" />
  </Icon>
);

export const ClockIcon = (props: IconProps) => (
  <Icon {...props}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M10 5.5V10l3 2" />
  </Icon>
);

export const SortIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="m6.5 8 3.5-3.5L13.5 8M6.5 12l3.5 3.5 3.5-3.5" />
  </Icon>
);

export const SortAscendingIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M10 15.5v-11M6 8.5l4-4 4 4" />
  </Icon>
);

export const SortDescendingIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M10 4.5v11M6 11.5l4 4 4-4" />
  </Icon>
);

export const ChevronLeftIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M12.5 4.5 7 10l5.5 5.5" />
  </Icon>
);

export const ChevronRightIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M7.5 4.5 13 10l-5.5 5.5" />
  </Icon>
);

export const MailIcon = (props: IconProps) => (
  <Icon {...props}>
    <rect x="2.5" y="4.5" width="15" height="11" rx="1.5" />
    <path d="m3 5.5 7 5.5 7-5.5" />
  </Icon>
);

export const RefreshIcon = (props: IconProps) => (
  <Icon {...props}>
    <path d="M16 10a6 6 0 1 1-1.8-4.3" />
    <path d="M16 3.5v3.4h-3.4" />
  </Icon>
);

/** The product mark: a court outline holding two bars, one per model (champion, challenger). */
export function ScorecourtMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 28 28" aria-hidden="true" focusable="false" className={className ?? 'size-7'}>
      <rect x="1" y="1" width="26" height="26" rx="5" className="fill-court-800" />
      <path d="M14 5v18" className="stroke-court-400" strokeWidth="1" strokeDasharray="2 2" />
      <rect x="7" y="11" width="4" height="10" rx="1" className="fill-champion-soft" />
      <rect x="17" y="7" width="4" height="14" rx="1" className="fill-challenger" />
    </svg>
  );
}
