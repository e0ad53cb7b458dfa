import type { ReactNode } from 'react';

type PageHeadingProps = { title: string; children?: ReactNode };

/** The page's one h1, and the browser tab's title with it so the two never disagree. */
export function PageHeading({ title, children }: PageHeadingProps) {
  return (
    <div className="mb-6">
      <title>{`${title} · Vanbay`}</title>
      <h1 className="text-3xl font-bold tracking-tight">{title}</h1>
      {children ? <p className="mt-2 max-w-prose text-lg text-ink-soft">{children}</p> : null}
    </div>
  );
}
