import { useCallback, useEffect, useId, useRef, useState, type ReactNode } from 'react';

export interface MenuRenderProps {
  close: () => void;
}

/**
 * A menu button (WAI-ARIA menu pattern): Enter/Space/ArrowDown open it on the first item, ArrowUp on
 * the last; arrows, Home and End move; Escape or Tab closes; Escape returns focus to the button.
 * Items are elements with role="menuitem" (or menuitemradio) rendered by the caller.
 */
export function Menu({
  label,
  button,
  buttonClassName = '',
  align = 'left',
  children,
  menuClassName = '',
}: {
  label: string;
  button: ReactNode;
  buttonClassName?: string;
  align?: 'left' | 'right';
  children: (props: MenuRenderProps) => ReactNode;
  menuClassName?: string;
}) {
  const [open, setOpen] = useState(false);
  const [focusOn, setFocusOn] = useState<'first' | 'last'>('first');
  const buttonRef = useRef<HTMLButtonElement>(null);
  const menuRef = useRef<HTMLDivElement>(null);
  const rootRef = useRef<HTMLDivElement>(null);
  const menuId = useId();

  const items = () => Array.from(menuRef.current?.querySelectorAll<HTMLElement>('[role^="menuitem"]:not([aria-disabled="true"])') ?? []);

  const close = useCallback((returnFocus = true) => {
    setOpen(false);
    if (returnFocus) buttonRef.current?.focus();
  }, []);

  useEffect(() => {
    if (!open) return;
    const list = items();
    (focusOn === 'first' ? list[0] : list[list.length - 1])?.focus();
    function onPointerDown(e: MouseEvent) {
      if (!rootRef.current?.contains(e.target as Node)) setOpen(false);
    }
    document.addEventListener('mousedown', onPointerDown);
    return () => document.removeEventListener('mousedown', onPointerDown);
  }, [open, focusOn]);

  function onButtonKeyDown(e: React.KeyboardEvent) {
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      e.preventDefault();
      setFocusOn(e.key === 'ArrowDown' ? 'first' : 'last');
      setOpen(true);
    }
  }

  function onMenuKeyDown(e: React.KeyboardEvent) {
    const list = items();
    const index = list.indexOf(document.activeElement as HTMLElement);
    if (e.key === 'Escape') {
      e.preventDefault();
      e.stopPropagation();
      close(true);
    } else if (e.key === 'Tab') {
      close(false);
    } else if (e.key === 'ArrowDown') {
      e.preventDefault();
      list[(index + 1) % list.length]?.focus();
    } else if (e.key === 'ArrowUp') {
      e.preventDefault();
      list[(index - 1 + list.length) % list.length]?.focus();
    } else if (e.key === 'Home') {
      e.preventDefault();
      list[0]?.focus();
    } else if (e.key === 'End') {
      e.preventDefault();
      list[list.length - 1]?.focus();
    }
  }

  return (
    <div ref={rootRef} className="relative min-w-0">
      <button
        ref={buttonRef}
        type="button"
        aria-haspopup="menu"
        aria-expanded={open}
        aria-controls={open ? menuId : undefined}
        aria-label={label}
        className={buttonClassName}
        onClick={() => {
          setFocusOn('first');
          setOpen((v) => !v);
        }}
        onKeyDown={onButtonKeyDown}
      >
        {button}
      </button>
      {open ? (
        <div
          ref={menuRef}
          id={menuId}
          role="menu"
          aria-label={label}
          onKeyDown={onMenuKeyDown}
          className={`absolute z-40 mt-1.5 min-w-56 rounded-md border border-graphite-200 bg-white py-1 text-graphite-900 shadow-lg ${
            align === 'right' ? 'right-0' : 'left-0'
          } ${menuClassName}`}
        >
          {children({ close: () => close(true) })}
        </div>
      ) : null}
    </div>
  );
}

export const menuItemClass =
  'flex w-full items-center gap-2 px-3 py-1.5 text-left text-[13px] text-graphite-800 outline-none hover:bg-graphite-50 focus:bg-copper-100 focus:text-graphite-950 focus:shadow-[inset_2px_0_0_var(--color-copper-500)]';

export function MenuSeparator() {
  return <div role="separator" className="my-1 h-px bg-graphite-100" />;
}

export function MenuLabel({ children }: { children: ReactNode }) {
  return (
    <div role="presentation" className="px-3 pt-1.5 pb-1 text-[11px] font-semibold tracking-wide text-graphite-500 uppercase">
      {children}
    </div>
  );
}
