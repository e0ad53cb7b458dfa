import type { ButtonHTMLAttributes } from 'react';

export type ButtonVariant = 'primary' | 'secondary';

// Secondary is outlined in ink, not a paler fill, so it keeps its edge on a glare-washed screen.
const variantClasses: Record<ButtonVariant, string> = {
  primary: 'border-coolant bg-coolant text-on-coolant',
  secondary: 'border-ink bg-panel text-ink hover:bg-ground',
};

/** The look of a button, for links that act as one (the week picker's previous and next). */
export function buttonClasses(variant: ButtonVariant = 'primary'): string {
  return `inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-plate border-2 px-5 text-base font-bold disabled:opacity-60 ${variantClasses[variant]}`;
}

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & { variant?: ButtonVariant };

export function Button({ className = '', type = 'button', variant = 'primary', ...props }: ButtonProps) {
  return <button type={type} className={`${buttonClasses(variant)} ${className}`} {...props} />;
}
