import bwipjs from 'bwip-js/node';

/** Code 128 carries the full tag text (letters, digits, hyphens) and is read by every counter scanner. */
const SYMBOLOGY = 'code128';
/** Code 128 needs a clear margin of at least ten bar widths on each side for a scanner to find the start. */
const QUIET_ZONE_MODULES = 10;

/**
 * A Code 128 barcode of `text` as an SVG document (bars only; pages print the text beside it in their own type).
 * `fill` lets the bars stretch to the box they are given: a 1D code stays readable when all bars widen alike.
 */
export function barcodeSvg(text: string, options: { heightMm?: number; includeText?: boolean; fill?: boolean } = {}): string {
  if (!text) throw new RangeError('a barcode needs text');
  const svg = bwipjs.toSVG({
    bcid: SYMBOLOGY,
    text,
    scale: 2,
    height: options.heightMm ?? 12,
    includetext: options.includeText ?? false,
    textxalign: 'center',
    paddingwidth: QUIET_ZONE_MODULES,
    paddingheight: 2,
  });
  return options.fill ? svg.replace(/^<svg\b/, '<svg preserveAspectRatio="none"') : svg;
}

/** The same barcode as a PNG, for the PDF. */
export async function barcodePng(text: string, options: { heightMm?: number; scale?: number } = {}): Promise<Buffer> {
  if (!text) throw new RangeError('a barcode needs text');
  return bwipjs.toBuffer({
    bcid: SYMBOLOGY,
    text,
    scale: options.scale ?? 3,
    height: options.heightMm ?? 10,
    includetext: false,
    paddingwidth: QUIET_ZONE_MODULES,
    paddingheight: 2,
  });
}
