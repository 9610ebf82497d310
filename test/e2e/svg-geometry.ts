/** Where an SVG element is drawn on screen, by its geometry rather than its painted box (a stroke left out). */
import type { Locator } from 'playwright-core';

/** Left and right screen x of a rect (or of the first rect inside a group). */
export async function svgEdges(el: Locator): Promise<[number, number]> {
  const rect = (await el.evaluate((e) => e.tagName)) === 'rect' ? el : el.locator('rect').first();
  return rect.evaluate((r) => {
    const g = r as SVGGraphicsElement;
    const b = g.getBBox();
    const m = g.getScreenCTM()!;
    return [m.a * b.x + m.e, m.a * (b.x + b.width) + m.e] as [number, number];
  });
}

/** Screen x of a vertical line's x1. */
export function svgLineX(el: Locator): Promise<number> {
  return el.evaluate((e) => {
    const m = (e as SVGGraphicsElement).getScreenCTM()!;
    return m.a * Number(e.getAttribute('x1')) + m.e;
  });
}
