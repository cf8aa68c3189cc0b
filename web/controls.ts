/**
 * A parameter's control: a slider (linear or logarithmic) with a number box beside it for an exact
 * value. The value shown in the box is always the value computed with; the scenario's own value is
 * kept, unrounded, until the user moves that slider (and comes back if the slider returns).
 */
import { parseTyped, positionOf, sliderValue, type Anchor, type ParameterSpec } from "../src/view/parameters.js";

export interface ControlEvents {
  /** The value changed (from the slider or from a valid number typed in the box). */
  changed(): void;
  /** The box holds text that is not an allowed value (null: the problem is gone). */
  problem(key: string, message: string | null): void;
}

export class ParameterControl {
  readonly row: HTMLDivElement;
  readonly slider: HTMLInputElement;
  readonly box: HTMLInputElement;
  value: number;
  private anchor: Anchor;

  constructor(
    readonly spec: ParameterSpec,
    initial: number,
    private readonly events: ControlEvents,
  ) {
    this.row = document.createElement("div");
    this.row.className = "param";
    this.row.dataset.key = spec.key;
    const label = document.createElement("label");
    label.htmlFor = `num-${spec.key}`;
    label.textContent = spec.label;
    this.box = document.createElement("input");
    this.box.id = `num-${spec.key}`;
    this.box.type = "text";
    this.box.inputMode = "decimal";
    this.box.spellcheck = false;
    this.box.autocomplete = "off";
    this.box.dataset.testid = `num-${spec.key}`;
    this.slider = document.createElement("input");
    this.slider.id = `in-${spec.key}`;
    this.slider.type = "range";
    this.slider.min = String(spec.min);
    this.slider.max = String(spec.max);
    this.slider.step = String(spec.step);
    this.slider.setAttribute("aria-label", `${spec.label}${spec.scale === "log" ? " (logarithmic slider)" : ""}`);
    this.slider.dataset.testid = `in-${spec.key}`;
    this.row.append(label, this.box, this.slider);
    this.value = initial;
    this.anchor = { value: initial, position: NaN };
    this.set(initial);
    this.slider.addEventListener("input", () => {
      this.value = sliderValue(spec, Number(this.slider.value), this.anchor);
      this.box.value = String(this.value);
      this.markProblem(null);
      this.events.changed();
    });
    this.box.addEventListener("change", () => {
      const parsed = parseTyped(spec, this.box.value);
      if ("problem" in parsed) {
        this.markProblem(parsed.problem);
        return;
      }
      this.markProblem(null);
      this.set(parsed.value);
      this.events.changed();
    });
  }

  /** Sets an exact value: the box shows it, the slider goes to the nearest position and remembers it. */
  set(value: number): void {
    this.value = value;
    this.box.value = String(value);
    this.box.setAttribute("aria-invalid", "false");
    this.slider.value = String(positionOf(this.spec, value));
    this.anchor = { value, position: Number(this.slider.value) };
  }

  show(visible: boolean): void {
    this.row.hidden = !visible;
  }

  /** Marks the control as the one an error asks for (or clears the mark). */
  mark(needed: boolean): void {
    this.row.classList.toggle("needed", needed);
  }

  private markProblem(message: string | null): void {
    this.box.setAttribute("aria-invalid", message === null ? "false" : "true");
    this.events.problem(this.spec.key, message);
  }
}

/** A text control (the spin): validated by `parse`, applied on Enter or when it loses focus. */
export class TextControl {
  readonly row: HTMLDivElement;
  readonly box: HTMLInputElement;
  value: string;

  constructor(
    readonly key: string,
    labelText: string,
    initial: string,
    parse: (text: string) => { problem: string } | object,
    private readonly events: ControlEvents,
  ) {
    this.row = document.createElement("div");
    this.row.className = "param";
    this.row.dataset.key = key;
    const label = document.createElement("label");
    label.htmlFor = `num-${key}`;
    label.textContent = labelText;
    this.box = document.createElement("input");
    this.box.id = `num-${key}`;
    this.box.type = "text";
    this.box.spellcheck = false;
    this.box.autocomplete = "off";
    this.box.dataset.testid = `num-${key}`;
    this.row.append(label, this.box);
    this.value = initial;
    this.box.value = initial;
    this.box.addEventListener("change", () => {
      const parsed = parse(this.box.value);
      if ("problem" in parsed) {
        this.box.setAttribute("aria-invalid", "true");
        this.events.problem(key, (parsed as { problem: string }).problem);
        return;
      }
      this.box.setAttribute("aria-invalid", "false");
      this.events.problem(key, null);
      this.value = this.box.value.trim();
      this.events.changed();
    });
  }

  set(value: string): void {
    this.value = value;
    this.box.value = value;
    this.box.setAttribute("aria-invalid", "false");
  }

  show(visible: boolean): void {
    this.row.hidden = !visible;
  }

  mark(needed: boolean): void {
    this.row.classList.toggle("needed", needed);
  }
}
