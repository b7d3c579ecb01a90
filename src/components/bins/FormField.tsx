import type { ReactNode } from 'react';
import { Icon } from '@/components/ui/Icon';

/** A labelled form field with its hint and the server's (or the page's) problem below it. */
export function FormField({ id, label, hint, problem, children }: { id: string; label: string; hint?: ReactNode; problem?: string; children: ReactNode }) {
  return (
    <div>
      <label className="label" htmlFor={id}>
        {label}
      </label>
      {children}
      {hint && (
        <p className="mt-1 text-sm text-ink-soft" id={`${id}-hint`}>
          {hint}
        </p>
      )}
      {problem && (
        <p className="mt-1 flex items-start gap-1 text-sm font-medium text-brick" id={`${id}-problem`}>
          <Icon name="alert" size={16} className="mt-0.5 shrink-0" /> <span>{problem}</span>
        </p>
      )}
    </div>
  );
}

/** aria attributes tying an input to its hint and problem. */
export function describedBy(id: string, problem: string | undefined) {
  return { 'aria-invalid': problem ? true : undefined, 'aria-describedby': `${id}-hint ${id}-problem` };
}
