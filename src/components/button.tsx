import { type ComponentProps, type ReactNode } from 'react';
import { Link } from 'react-router';
import { cn } from '@/lib/cn';
import { Spinner } from '@/components/spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'ghost' | 'danger';
export type ButtonSize = 'sm' | 'md';

const base =
  'inline-flex items-center justify-center gap-1.5 rounded-md border font-medium whitespace-nowrap transition-colors ' +
  'focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500 ' +
  'disabled:cursor-not-allowed disabled:opacity-60 print:hidden';

const variants: Record<ButtonVariant, string> = {
  primary: 'border-court-700 bg-court-700 text-white hover:bg-court-800 hover:border-court-800',
  secondary: 'border-line-strong bg-paper-raised text-ink hover:bg-paper-sunk',
  ghost: 'border-transparent bg-transparent text-court-700 hover:bg-court-50',
  danger: 'border-bad bg-bad text-white hover:bg-bad-strong hover:border-bad-strong',
};

const sizes: Record<ButtonSize, string> = {
  sm: 'h-8 px-2.5 text-sm',
  md: 'h-10 px-4 text-sm',
};

export function buttonClasses({
  variant = 'secondary',
  size = 'md',
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}): string {
  return cn(base, variants[variant], sizes[size], className);
}

type ButtonProps = ComponentProps<'button'> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner, disables the button and announces it as busy. */
  loading?: boolean;
  /** What the button says while loading ("Signing in…"); defaults to its children. */
  loadingText?: ReactNode;
  icon?: ReactNode;
};

export function Button({
  variant,
  size,
  loading = false,
  loadingText,
  icon,
  disabled,
  className,
  children,
  type = 'button',
  ...props
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      className={buttonClasses({ variant, size, className })}
      {...props}
    >
      {loading ? <Spinner /> : icon}
      <span>{loading && loadingText ? loadingText : children}</span>
    </button>
  );
}

type ButtonLinkProps = ComponentProps<typeof Link> & { variant?: ButtonVariant; size?: ButtonSize; icon?: ReactNode };

/** A link that looks like a button: for navigation ("Go to People"), never for actions. */
export function ButtonLink({ variant, size, icon, className, children, ...props }: ButtonLinkProps) {
  return (
    <Link className={buttonClasses({ variant, size, className })} {...props}>
      {icon}
      <span>{children}</span>
    </Link>
  );
}
