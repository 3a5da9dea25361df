/** Opens a native <dialog> as modal while `open` is true (focus is kept inside; Escape fires `cancel`). */
import { useEffect, type RefObject } from 'react';

export function useModalDialog(ref: RefObject<HTMLDialogElement | null>, open: boolean): void {
  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [ref, open]);
}
