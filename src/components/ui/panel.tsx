import type { ReactNode } from 'react';

type PanelProps = { children: ReactNode; className?: string };

export function Panel({ children, className = '' }: PanelProps) {
  return (
    <section className={`rounded-plate border-2 border-rule bg-panel p-5 ${className}`}>{children}</section>
  );
}
