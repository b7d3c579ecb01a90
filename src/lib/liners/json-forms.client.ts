// Small server-rendered forms of the liner pages: a form marked `data-post="/api/…"` sends its named fields
// as JSON (type=number and `data-number` fields as numbers, checkboxes as true/false, the pressed button's
// name=value too), then reloads the page — or goes to `data-then`, where `{id}` is the answer's `id`.
// A refusal is written into the form's `[data-form-error]` element (role=alert), field messages beside it.
import { api, ApiError } from '@/lib/api.client';

function bodyOf(form: HTMLFormElement, submitter: HTMLButtonElement | null): Record<string, unknown> {
  const body: Record<string, unknown> = {};
  for (const el of Array.from(form.elements)) {
    if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement || el instanceof HTMLTextAreaElement) || !el.name || el.disabled) continue;
    if (el instanceof HTMLInputElement && el.type === 'checkbox') {
      body[el.name] = el.checked;
      continue;
    }
    if (el instanceof HTMLInputElement && el.type === 'file') continue;
    const v = el.value;
    const numeric = (el instanceof HTMLInputElement && el.type === 'number') || el.dataset.number !== undefined;
    if (numeric) {
      if (v.trim() !== '') body[el.name] = Number(v);
    } else if (v !== '' || el.dataset.keepEmpty !== undefined) body[el.name] = v;
  }
  if (submitter?.name) body[submitter.name] = submitter.value;
  return body;
}

export function wireJsonForms(root: ParentNode = document): void {
  for (const form of Array.from(root.querySelectorAll<HTMLFormElement>('form[data-post]'))) {
    form.addEventListener('submit', async (e) => {
      e.preventDefault();
      const submitter = (e as SubmitEvent).submitter as HTMLButtonElement | null;
      if (submitter?.dataset.confirm && !window.confirm(submitter.dataset.confirm)) return;
      const box = form.querySelector<HTMLElement>('[data-form-error]');
      const buttons = Array.from(form.querySelectorAll<HTMLButtonElement>('button'));
      for (const b of buttons) b.disabled = true;
      try {
        const data = await api.post<Record<string, unknown>>(form.dataset.post!, bodyOf(form, submitter));
        const then = form.dataset.then;
        const id = data && typeof data === 'object' ? ((Object.values(data)[0] as { id?: number } | undefined)?.id ?? '') : '';
        if (then) location.assign(then.replace('{id}', String(id)));
        else location.reload();
      } catch (err) {
        for (const b of buttons) b.disabled = false;
        const fields = err instanceof ApiError ? Object.entries(err.fieldMessages()).map(([, m]) => m) : [];
        if (box) {
          box.textContent = [(err as Error).message, ...fields].join(' ');
          box.classList.remove('hidden');
          box.focus();
        }
      }
    });
  }
}
