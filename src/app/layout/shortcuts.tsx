import { useEffect, useLayoutEffect, useRef, useState } from 'react';
import { useNavigate } from 'react-router';
import type { Role } from '../../../shared/api/users';
import { isAllowed } from '../../../shared/api/policy';
import { Button } from '../../components/ui/button';
import { paths } from '../paths';
import { sectionsFor } from './sections';

export type Shortcut = { keys: string; what: string; run: () => void };

/** The keys a role may use: a section it cannot open has no key, "new job" only for the workshop. */
export function shortcutsFor(role: Role, navigate: (to: string) => void): Shortcut[] {
  const open = new Set(sectionsFor(role).map((section) => section.path));
  const go = (key: string, path: string, what: string): Shortcut[] =>
    open.has(path) ? [{ keys: `g ${key}`, what, run: () => navigate(path) }] : [];
  return [
    ...(isAllowed(role, 'jobs', 'create')
      ? [{ keys: 'n', what: 'New job', run: () => navigate(`${paths.jobs}?new=1`) }]
      : []),
    { keys: '/', what: 'Search this page', run: focusSearch },
    ...go('w', paths.week, 'Go to the week'),
    ...go('j', paths.jobs, 'Go to jobs'),
    ...go('c', paths.customers, 'Go to customers and machines'),
    ...go('i', paths.invoices, 'Go to invoices'),
    ...go('m', paths.mileage, 'Go to mileage'),
    ...go('r', paths.reminders, 'Go to reminders'),
  ];
}

function focusSearch() {
  const box = document.querySelector<HTMLInputElement>('main input[type="search"]');
  box?.focus();
}

/** Keys typed into a field are the field's, never a shortcut. */
function typingInField(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName);
}

/**
 * Single keys for the frequent moves at the desk ("g" then a letter to go somewhere), and "?" for
 * the list of them. Nothing fires while a field has the focus or a modifier key is held.
 */
export function KeyboardShortcuts({ role }: { role: Role }) {
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const pendingG = useRef(false);
  const dialog = useRef<HTMLDialogElement>(null);
  const shortcuts = shortcutsFor(role, (to) => void navigate(to));

  // Listening from the commit on (a layout effect, not a passive one) means a key pressed as soon as
  // the page shows is never lost to an effect that has not run yet.
  useLayoutEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (event.defaultPrevented || event.ctrlKey || event.metaKey || event.altKey) return;
      if (typingInField(event.target)) return;
      if (event.key === '?') {
        event.preventDefault();
        setOpen(true);
        return;
      }
      const keys = pendingG.current ? `g ${event.key}` : event.key;
      pendingG.current = !pendingG.current && event.key === 'g';
      const shortcut = shortcuts.find((s) => s.keys === keys);
      if (shortcut) {
        event.preventDefault();
        setOpen(false);
        shortcut.run();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [shortcuts]);

  useEffect(() => {
    const element = dialog.current;
    if (!element) return;
    if (open && !element.open) element.showModal?.();
    if (!open && element.open) element.close();
  }, [open]);

  return (
    <>
      <button
        type="button"
        onClick={() => setOpen(true)}
        className="hidden min-h-touch items-center gap-2 rounded-plate px-3 text-base font-bold text-ink-soft hover:text-ink lg:inline-flex"
      >
        <kbd className="rounded-plate border-2 border-current px-2 font-mono">?</kbd> Shortcuts
      </button>
      <dialog
        ref={dialog}
        aria-labelledby="shortcuts-title"
        onClose={() => setOpen(false)}
        className="m-auto max-w-md rounded-plate border-3 border-ink bg-panel p-6 text-ink backdrop:bg-ink/60"
      >
        <h2 id="shortcuts-title" className="text-2xl font-bold">
          Keyboard shortcuts
        </h2>
        <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-6 gap-y-2 text-lg">
          {[...shortcuts, { keys: '?', what: 'Show this list' }].map((shortcut) => (
            <div key={shortcut.keys} className="contents">
              <dt>
                {shortcut.keys.split(' ').map((key, index) => (
                  <span key={index}>
                    {index > 0 ? ' then ' : ''}
                    <kbd className="rounded-plate border-2 border-ink px-2 font-mono font-bold">{key}</kbd>
                  </span>
                ))}
              </dt>
              <dd>{shortcut.what}</dd>
            </div>
          ))}
        </dl>
        <Button className="mt-6" onClick={() => setOpen(false)}>
          Close
        </Button>
      </dialog>
    </>
  );
}
