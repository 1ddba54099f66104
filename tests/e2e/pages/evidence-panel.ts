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

  /** True when nothing inside the panel is wider than the panel (no sideways scrolling). */
  async fitsItsWidth(): Promise<boolean> {
    return this.detail.evaluate((el) => {
      const boxes = [el, ...Array.from(el.querySelectorAll<HTMLElement>("*"))].filter((e) => getComputedStyle(e).overflowX !== "visible");
      return boxes.every((e) => e.scrollWidth <= e.clientWidth + 1) && el.getBoundingClientRect().right <= window.innerWidth + 1;
    });
  }
}
