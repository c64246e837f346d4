import bwipjs from 'bwip-js/node';

/** Code 128 carries the full tag text (letters, digits, hyphens) and is read by every counter scanner. */
const SYMBOLOGY = 'code128';

/** A Code 128 barcode of `text` as an SVG document (bars only; pages print the text beside it in their own type). */
export function barcodeSvg(text: string, options: { heightMm?: number; includeText?: boolean } = {}): string {
  if (!text) throw new RangeError('a barcode needs text');
  return bwipjs.toSVG({
    bcid: SYMBOLOGY,
    text,
    scale: 2,
    height: options.heightMm ?? 12,
    includetext: options.includeText ?? false,
    textxalign: 'center',
    paddingwidth: 4,
    paddingheight: 2,
  });
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
    paddingwidth: 4,
    paddingheight: 2,
  });
}
