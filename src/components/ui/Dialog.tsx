import { useEffect, useRef, type ReactNode } from 'react';

/**
 * A modal built on the native <dialog>: focus is kept inside, Escape closes,
 * and the page behind is inert. Rendered only while open.
 */
export function Dialog({ title, onClose, children, labelId }: { title: string; onClose: () => void; children: ReactNode; labelId: string }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (d && !d.open) d.showModal();
    return () => d?.close();
  }, []);
  return (
    <dialog
      ref={ref}
      aria-labelledby={labelId}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className="w-[min(36rem,calc(100vw-1.5rem))] max-h-[calc(100dvh-1.5rem)] rounded-lg border border-paper-line bg-card p-0 text-ink shadow-xl backdrop:bg-ink/50"
    >
      <div className="flex items-start justify-between gap-4 border-b border-paper-line px-5 py-4">
        <h2 id={labelId}>{title}</h2>
        <button type="button" className="btn-quiet min-h-0 h-9 px-3 text-sm" onClick={onClose}>
          Close
        </button>
      </div>
      <div className="px-5 py-4">{children}</div>
    </dialog>
  );
}

/** A form field's problem, read by screen readers with the field (aria-describedby). */
export function FieldProblem({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 text-sm font-medium text-brick">
      {message}
    </p>
  );
}
