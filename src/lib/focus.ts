import { useCallback, useRef, type KeyboardEvent } from "react";

/**
 * A ref callback that moves the focus to an element when it appears: an outcome that replaces the
 * control the reader pressed (a form that is gone once sent, a button disabled while busy, which
 * drops the focus) takes it, so it is read out and the reader is not sent back to the page's top.
 * Module-level and stable, so the focus moves once, on mount, and not on every re-render.
 */
export const focusWhenShown = (el: HTMLElement | null) => {
  el?.focus();
};

/** onKeyDown for an inline confirmation: Escape cancels it, as it closes a dialog. */
export function cancelOnEscape(cancel: () => void) {
  return (e: KeyboardEvent) => {
    if (e.key !== "Escape") return;
    e.preventDefault();
    cancel();
  };
}

/**
 * For the control that opens an inline confirmation it is replaced by: `returnFocus()` on Cancel or
 * Escape, and the control takes the focus again as soon as it is back on screen.
 */
export function useFocusReturn<T extends HTMLElement>() {
  const pending = useRef(false);
  const ref = useCallback((el: T | null) => {
    if (el && pending.current) {
      pending.current = false;
      el.focus();
    }
  }, []);
  return { ref, returnFocus: () => (pending.current = true) };
}
