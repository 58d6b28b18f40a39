/**
 * The copy button of the "Cite this sheet" block: copies the citation's text to the clipboard, or, where the
 * clipboard is not available (an insecure origin, a refused permission), selects it for the reader to copy. Builds
 * no markup: it shows the button (hidden without JavaScript) and writes a status text.
 */
export function mountCiteCopy(doc: Document): void {
  for (const button of Array.from(doc.querySelectorAll<HTMLButtonElement>("button[data-cite-copy]"))) {
    const target = doc.getElementById(button.dataset.citeCopy ?? "");
    const status = button.parentElement?.querySelector<HTMLElement>(".cite-status") ?? null;
    if (!target) continue;
    button.hidden = false;
    const select = () => {
      const range = doc.createRange();
      range.selectNodeContents(target);
      const sel = doc.getSelection();
      sel?.removeAllRanges();
      sel?.addRange(range);
    };
    button.addEventListener("click", () => {
      const text = target.textContent ?? "";
      const done = (words: string) => {
        if (status) status.textContent = words;
      };
      if (navigator.clipboard?.writeText) {
        navigator.clipboard.writeText(text).then(
          () => done("Copied."),
          () => {
            select();
            done("Selected: copy it with your keyboard.");
          },
        );
      } else {
        select();
        done("Selected: copy it with your keyboard.");
      }
    });
  }
}
