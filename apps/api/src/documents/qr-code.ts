// The QR code printed on the wallet card. Error correction M survives a scuffed card; the 4-module quiet
// zone is the one the QR standard asks for.
import QRCode from 'qrcode';

export function qrCodePng(url: string): Promise<Buffer> {
  return QRCode.toBuffer(url, {
    type: 'png',
    errorCorrectionLevel: 'M',
    margin: 4,
    scale: 8,
    color: { dark: '#000000', light: '#ffffff' },
  });
}
