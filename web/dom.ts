/** Small DOM helpers shared by the viewer's views. */

export const $ = <T extends HTMLElement>(id: string): T => document.getElementById(id) as T;

/** Sets the text of the element with this `data-testid`. */
export function setText(testId: string, text: string): void {
  document.querySelector(`[data-testid="${testId}"]`)!.textContent = text;
}

export const fmt = (v: number, d = 2): string => (Number.isFinite(v) ? v.toFixed(d) : "—");

/** What the page exposes to tests and the benchmark (`window.calorbitViewer`). */
export function expose(value: unknown): void {
  (window as unknown as { calorbitViewer: unknown }).calorbitViewer = value;
}

/** Hides the live controls (sliders, regime menu, export buttons): views computed by the CLI. */
export function hideLumpedPanels(): void {
  document
    .querySelector<HTMLElement>(".controls")!
    .querySelectorAll("label, .buttons, h3, #params, #regime-params")
    .forEach((el) => ((el as HTMLElement).style.display = "none"));
}

/** Saves a blob as a file through a temporary link. */
export function download(blob: Blob, name: string): void {
  const a = document.createElement("a");
  a.href = URL.createObjectURL(blob);
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 1000);
}
