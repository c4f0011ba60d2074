import bwipjs from 'bwip-js/node';
import type { Symbology } from '~/contracts/labels';
import { AppError } from '~/lib/server/errors';

function options(text: string, symbology: Symbology) {
  // Code 128 bars 10 units tall per module scale; the human-readable text is printed by the
  // label layout, not by the symbol, so it can use the app's type.
  return symbology === 'code128'
    ? { bcid: 'code128', text, height: 9, includetext: false, paddingwidth: 0, paddingheight: 0 }
    : { bcid: 'datamatrix', text, paddingwidth: 0, paddingheight: 0 };
}

/** The barcode as an SVG document (scalable; the label layout sizes it in millimetres). */
export function barcodeSvg(text: string, symbology: Symbology = 'code128'): string {
  try {
    return bwipjs.toSVG(options(text, symbology));
  } catch (err) {
    throw new AppError('barcode_not_encodable', { text, symbology, reason: (err as Error).message });
  }
}

/** The same barcode as a PNG at `scale` pixels per module. */
export async function barcodePng(text: string, symbology: Symbology = 'code128', scale = 3): Promise<Buffer> {
  try {
    return await bwipjs.toBuffer({ ...options(text, symbology), scale });
  } catch (err) {
    throw new AppError('barcode_not_encodable', { text, symbology, reason: (err as Error).message });
  }
}
