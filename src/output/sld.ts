// The report's map as OGC Symbology Encoding 1.1 inside Styled Layer Descriptor 1.1 (OGC 05-078r4,
// 05-077r4) [published], so a desktop GIS draws the strips and lines as the report does. Output
// knows nothing of the report: its look (palette, hatches, the loss per km drawn widest) comes in
// as plain data, which src/index.ts takes from src/report/palette.ts and map-svg.ts.

/** One strip class as the report fills it: colour, SVG hatch path in a 6 x 6 tile, hatch colour. */
export interface FillLook {
  label: string;
  colour: string;
  hatch: string;
  hatchColour: string;
}

export interface StripsLook {
  /** Class names in legend order, each a key of `styles` and a value of the strips' `risk` field. */
  classes: readonly string[];
  styles: Readonly<Record<string, FillLook>>;
}

export interface LinesLook {
  colours: { canal: string; drain: string };
  /** The loss per km (m^3/d/km) drawn at the widest; 0 when no line loses water. */
  widthTopM3PerDayKm: number;
}

// the report's hatch paths (src/report/palette.ts) as SE well-known marks for a GraphicFill
// (the `shape://` marks most SLD readers know [from memory]); '' is a plain fill
const HATCH_MARKS: Readonly<Record<string, string>> = {
  'M0 0L6 6M6 0L0 6': 'shape://times',
  'M0 6L6 0M-1 1L1 -1M5 7L7 5': 'shape://slash',
  'M2.5 3h1': 'shape://dot',
  'M0 3h6': 'shape://horline',
};

// the report's map draws lines from 0.8 to at most 4.5 px wide (src/report/map-svg.ts)
const LINE_MIN_PX = 0.8;
const LINE_MAX_PX = 4.5;
// four width steps, even in width: the map's width grows with the square root of loss per km
const WIDTH_STEPS = 4;
const DRAIN_DASH = '5 3';
const HATCH_OPACITY = 0.55;

const HEADER =
  '<?xml version="1.0" encoding="UTF-8"?>\n' +
  '<StyledLayerDescriptor version="1.1.0" xmlns="http://www.opengis.net/sld" xmlns:se="http://www.opengis.net/se" ' +
  'xmlns:ogc="http://www.opengis.net/ogc" xmlns:xlink="http://www.w3.org/1999/xlink" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" ' +
  'xsi:schemaLocation="http://www.opengis.net/sld http://schemas.opengis.net/sld/1.1.0/StyledLayerDescriptor.xsd">\n';

export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&${{ '&': 'amp', '<': 'lt', '>': 'gt', '"': 'quot', "'": 'apos' }[c]};`);
}

function document(layer: string, title: string, rules: string[]): string {
  return (
    HEADER +
    `<NamedLayer><se:Name>${escapeXml(layer)}</se:Name><UserStyle><se:Name>${escapeXml(layer)}</se:Name>` +
    `<se:Description><se:Title>${escapeXml(title)}</se:Title></se:Description>\n<se:FeatureTypeStyle>\n` +
    rules.join('\n') +
    '\n</se:FeatureTypeStyle></UserStyle></NamedLayer>\n</StyledLayerDescriptor>\n'
  );
}

const param = (name: string, value: string | number) => `<se:SvgParameter name="${name}">${escapeXml(String(value))}</se:SvgParameter>`;
const equalTo = (field: string, value: string) =>
  `<ogc:PropertyIsEqualTo><ogc:PropertyName>${escapeXml(field)}</ogc:PropertyName><ogc:Literal>${escapeXml(value)}</ogc:Literal></ogc:PropertyIsEqualTo>`;

/** SLD for the strips layer: one rule per risk class on the `risk` field, the class colour under its hatch. */
export function stripsSld(look: StripsLook, layer = 'strips'): string {
  const rules = look.classes.map((kind) => {
    const style = look.styles[kind];
    if (!style) throw new Error(`Unexpected strip class without a style: ${kind}.`);
    const mark = HATCH_MARKS[style.hatch];
    if (style.hatch !== '' && mark === undefined) throw new Error(`Unexpected hatch of class ${kind}: "${style.hatch}".`);
    const hatch = mark
      ? `<se:PolygonSymbolizer><se:Fill><se:GraphicFill><se:Graphic><se:Mark><se:WellKnownName>${mark}</se:WellKnownName>` +
        `<se:Stroke>${param('stroke', style.hatchColour)}${param('stroke-opacity', HATCH_OPACITY)}${param('stroke-width', 1)}</se:Stroke>` +
        `</se:Mark><se:Size>6</se:Size></se:Graphic></se:GraphicFill></se:Fill></se:PolygonSymbolizer>`
      : '';
    return (
      `<se:Rule><se:Name>${escapeXml(style.label)}</se:Name><se:Description><se:Title>${escapeXml(style.label)}</se:Title></se:Description>` +
      `<ogc:Filter>${equalTo('risk', kind)}</ogc:Filter>` +
      `<se:PolygonSymbolizer><se:Fill>${param('fill', style.colour)}</se:Fill>` +
      `<se:Stroke>${param('stroke', '#444444')}${param('stroke-width', 0.6)}</se:Stroke></se:PolygonSymbolizer>${hatch}</se:Rule>`
    );
  });
  return document(layer, 'Strips by risk class (as the doab report)', rules);
}

function round3(value: number): number {
  return Number(value.toPrecision(3));
}

/**
 * SLD for the lines layer: canals solid, drains dashed, each in WIDTH_STEPS widths by loss per km
 * (`net_loss_m3_d_km`), the step edges where the map's square-root width reaches each quarter of
 * its range; lines not losing water, or without a figure, at the thinnest.
 */
export function linesSld(look: LinesLook, layer = 'lines'): string {
  const top = look.widthTopM3PerDayKm;
  const rules: string[] = [];
  for (const kind of ['canal', 'drain'] as const) {
    const stroke = (widthPx: number) =>
      `<se:LineSymbolizer><se:Stroke>${param('stroke', look.colours[kind])}${param('stroke-width', Math.round(widthPx * 10) / 10)}` +
      `${param('stroke-linecap', 'round')}${kind === 'drain' ? param('stroke-dasharray', DRAIN_DASH) : ''}</se:Stroke></se:LineSymbolizer>`;
    const isKind = equalTo('kind_used', kind);
    const lossField = '<ogc:PropertyName>net_loss_m3_d_km</ogc:PropertyName>';
    if (!(top > 0)) {
      rules.push(`<se:Rule><se:Name>${kind}</se:Name><ogc:Filter>${isKind}</ogc:Filter>${stroke(LINE_MIN_PX)}</se:Rule>`);
      continue;
    }
    // edges in loss per km: width fraction f is reached at top * f^2
    const edges = Array.from({ length: WIDTH_STEPS + 1 }, (_, i) => (i === 0 ? 0 : round3(top * (i / WIDTH_STEPS) ** 2)));
    rules.push(
      `<se:Rule><se:Name>${kind}, not losing or not known</se:Name><ogc:Filter><ogc:And>${isKind}<ogc:Not><ogc:PropertyIsGreaterThan>${lossField}` +
        `<ogc:Literal>0</ogc:Literal></ogc:PropertyIsGreaterThan></ogc:Not></ogc:And></ogc:Filter>${stroke(LINE_MIN_PX)}</se:Rule>`,
    );
    for (let i = 0; i < WIDTH_STEPS; i++) {
      const last = i === WIDTH_STEPS - 1;
      const widthPx = LINE_MIN_PX + (LINE_MAX_PX - LINE_MIN_PX) * ((i + 1) / WIDTH_STEPS);
      const upper = last ? '' : `<ogc:PropertyIsLessThanOrEqualTo>${lossField}<ogc:Literal>${edges[i + 1]}</ogc:Literal></ogc:PropertyIsLessThanOrEqualTo>`;
      const name = last ? `${kind}, over ${edges[i]} m3/d per km` : `${kind}, ${edges[i]} to ${edges[i + 1]} m3/d per km`;
      rules.push(
        `<se:Rule><se:Name>${escapeXml(name)}</se:Name><ogc:Filter><ogc:And>${isKind}<ogc:PropertyIsGreaterThan>${lossField}<ogc:Literal>${edges[i]}</ogc:Literal>` +
          `</ogc:PropertyIsGreaterThan>${upper}</ogc:And></ogc:Filter>${stroke(widthPx)}</se:Rule>`,
      );
    }
  }
  return document(layer, 'Lines by loss per km, drains dashed (as the doab report)', rules);
}
