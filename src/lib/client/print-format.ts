/**
 * Wires a "print on" radio group to a printable element: each choice sets one class on the element,
 * the choice is remembered in the browser, and the Print button opens the print dialog.
 */
export function wirePrintFormat(options: { storageKey: string; targetId: string; radioSelector: string; classes: Record<string, string> }): void {
  const target = document.getElementById(options.targetId);
  const radios = [...document.querySelectorAll<HTMLInputElement>(options.radioSelector)];
  const apply = (format: string) => {
    if (!target || !(format in options.classes)) return;
    for (const [value, cls] of Object.entries(options.classes)) target.classList.toggle(cls, value === format);
    for (const r of radios) r.checked = r.value === format;
  };
  const saved = localStorage.getItem(options.storageKey);
  if (saved) apply(saved);
  for (const r of radios) {
    r.addEventListener('change', () => {
      if (!r.checked) return;
      localStorage.setItem(options.storageKey, r.value);
      apply(r.value);
    });
  }
  document.querySelector('[data-print]')?.addEventListener('click', () => window.print());
}
