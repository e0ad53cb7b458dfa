import type { ReactNode } from 'react';
import { Panel } from './panel';

type EmptyStateProps = { title: string; children: ReactNode };

export function EmptyState({ title, children }: EmptyStateProps) {
  return (
    <Panel className="border-dashed">
      <h2 className="text-xl font-bold">{title}</h2>
      <div className="mt-2 max-w-prose text-lg text-ink-soft">{children}</div>
    </Panel>
  );
}
