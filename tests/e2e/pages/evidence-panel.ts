// Page object: the evidence of one joint opened in Review ("Selected joint"): its facts
// (procedure, pipe, equipment), the plan-versus-recorded table, and the pressure-trace form.
import { expect, type Locator } from "@playwright/test";

export class EvidencePanel {
  constructor(private readonly detail: Locator) {}

  /** The description beside a fact's term ("Procedure", "Pipe", …). */
  fact(term: string): Locator {
    return this.detail.locator("dt", { hasText: new RegExp(`^${term}$`) }).locator("xpath=following-sibling::dd[1]");
  }

  valuesTable(): Locator {
    return this.detail.getByRole("table", { name: "Plan and recorded values" });
  }

  /** The plan-versus-recorded row of a value, by the value's name as shown. */
  valueRow(label: string): Locator {
    return this.valuesTable().getByRole("row", { name: new RegExp(`^${label.replace(/[()]/g, "\\$&")}\\b`) });
  }

  async attachTrace(file: { name: string; buffer: Buffer }): Promise<void> {
    await this.detail.getByLabel("Pressure trace file (CSV)").setInputFiles({ name: file.name, mimeType: "text/csv", buffer: file.buffer });
    await this.detail.getByRole("button", { name: "Attach trace" }).click();
    await expect(this.detail.getByRole("button", { name: "Attach trace" })).toBeEnabled({ timeout: 20_000 });
  }

  /** The joint's "Pressure trace" section (the trace shown, or that none is attached). */
  traceRegion(): Locator {
    return this.detail.getByRole("region", { name: "Pressure trace" });
  }

  /** The attach form's message (a refusal; after a trace is attached the panel shows the new revision). */
  traceMessage(): Locator {
    return this.detail.getByRole("form", { name: /^Attach a pressure trace/ }).getByRole("status").first();
  }

  /**
   * True when the panel fits the window, nothing in it scrolls sideways, and no part of its
   * tables sticks out past its right edge (screen-reader-only text, 1 px wide, is left out).
   */
  async fitsItsWidth(): Promise<boolean> {
    return this.detail.evaluate((el) => {
      const panel = el.getBoundingClientRect();
      const all = Array.from(el.querySelectorAll<HTMLElement>("*"));
      const scrollersFit = [el as HTMLElement, ...all].filter((e) => ["auto", "scroll"].includes(getComputedStyle(e).overflowX)).every((e) => e.scrollWidth <= e.clientWidth + 1);
      const insidePanel = Array.from(el.querySelectorAll<HTMLElement>("table, table *")).every((e) => {
        const r = e.getBoundingClientRect();
        return r.width <= 1 || r.right <= panel.right + 1;
      });
      return scrollersFit && insidePanel && panel.right <= window.innerWidth + 1;
    });
  }
}
