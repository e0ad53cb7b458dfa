import type { ButtonHTMLAttributes } from 'react';

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement>;

export function Button({ className = '', type = 'button', ...props }: ButtonProps) {
  return (
    <button
      type={type}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center rounded-plate bg-coolant px-5 text-base font-bold text-on-coolant disabled:opacity-60 ${className}`}
      {...props}
    />
  );
}
