import QRCode from 'qrcode';

/**
 * The QR code of a container label as SVG: error correction level M (about 15 % of the symbol
 * may be damaged, ISO/IEC 18004) and the standard quiet zone of 4 modules.
 */
export async function qrSvg(data: string): Promise<string> {
  return QRCode.toString(data, { type: 'svg', errorCorrectionLevel: 'M', margin: 4 });
}
