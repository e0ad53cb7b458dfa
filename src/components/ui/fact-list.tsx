import type { ReactNode } from 'react';

export type Fact = { term: string; value: ReactNode };

/** A record's facts as term and value pairs, two columns where there is room, one on a phone. */
export function FactList({ facts }: { facts: readonly Fact[] }) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-[max-content_minmax(0,1fr)]">
      {facts.map((fact) => (
        // gap-y only: a subgrid keeps the list's column gap between term and value.
        <div key={fact.term} className="grid gap-y-0.5 sm:col-span-2 sm:grid-cols-subgrid">
          <dt className="text-base font-bold text-ink-soft">{fact.term}</dt>
          <dd className="text-lg break-words">{fact.value}</dd>
        </div>
      ))}
    </dl>
  );
}
