// The boxes of an SVG's texts as the drawing measures them (labelBox), read back from the emitted
// attributes, and the pairs that meet: for the cross-section label tests.
import { labelBox, type LabelBox } from '../../src/report/profile-svg.js';

export interface DrawnText {
  text: string;
  box: LabelBox;
  element: string;
}

function attribute(element: string, name: string): string | null {
  return new RegExp(` ${name}="([^"]*)"`).exec(element)?.[1] ?? null;
}

/** Every <text> of an SVG with its box (a quarter turn applied where it has one). */
export function drawnTexts(svg: string): DrawnText[] {
  const decode = (s: string) => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  return [...svg.matchAll(/<text([^>]*)>([^<]*)<\/text>/g)].map((m) => {
    const element = m[1];
    const text = decode(m[2]);
    const anchor = (attribute(element, 'text-anchor') ?? 'start') as 'start' | 'middle' | 'end';
    const size = Number(attribute(element, 'font-size') ?? 11);
    const bold = attribute(element, 'font-weight') === 'bold';
    const turned = /transform="translate\(([\d.]+) ([\d.]+)\) rotate\(-90\)"/.exec(element);
    if (turned) {
      const [tx, ty] = [Number(turned[1]), Number(turned[2])];
      const local = labelBox(text, 0, 0, anchor, size, bold);
      // a quarter turn left: along the text is up the page, above the text is to the left
      return { text, element, box: [tx + local[1], ty - local[2], tx + local[3], ty - local[0]] as LabelBox };
    }
    return { text, element, box: labelBox(text, Number(attribute(element, 'x')), Number(attribute(element, 'y')), anchor, size, bold) };
  });
}

/** Pairs of texts whose boxes meet. */
export function overlaps(texts: DrawnText[]): string[] {
  const found: string[] = [];
  for (let i = 0; i < texts.length; i++) {
    for (let j = i + 1; j < texts.length; j++) {
      const a = texts[i].box, b = texts[j].box;
      if (a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3]) found.push(`"${texts[i].text}" meets "${texts[j].text}"`);
    }
  }
  return found;
}
