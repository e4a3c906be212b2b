/**
 * The certificate PDF: pdfkit with Lato embedded (latin and latin-ext subsets, so names with
 * diacritics render), a QR code that opens the verification page, the signature as a short code,
 * and the safety caution in small print.
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import * as fontkit from 'fontkit';
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';

const require = createRequire(import.meta.url);
const fontDir = path.join(path.dirname(require.resolve('@fontsource/lato/package.json')), 'files');
const FACES = {
  regular: { latin: 'lato-latin-400-normal.woff', ext: 'lato-latin-ext-400-normal.woff' },
  bold: { latin: 'lato-latin-700-normal.woff', ext: 'lato-latin-ext-700-normal.woff' },
} as const;
const latinCoverage = fontkit.openSync(path.join(fontDir, FACES.regular.latin));

export interface CertificateData {
  number: string;
  holderName: string;
  organizationName: string | null;
  levelName: string;
  trials: { title: string; passedAt: string }[];
  issuedAt: Date;
  expiresAt: Date;
  signatureCode: string;
  verifyUrl: string;
}

export const SAFETY_CAUTION =
  "A simulated assessment does not authorise anyone to operate a real robot. Site-specific training, the employer's written authorisation and the applicable safety standards and local regulations for mobile robots and driverless industrial trucks always apply.";

const day = (d: Date) => d.toISOString().slice(0, 10);

/** Splits text into runs that the latin subset can draw and runs that need latin-ext. */
function runs(text: string): { text: string; ext: boolean }[] {
  const out: { text: string; ext: boolean }[] = [];
  for (const ch of text) {
    const ext = !latinCoverage.hasGlyphForCodePoint(ch.codePointAt(0)!);
    const last = out[out.length - 1];
    if (last && last.ext === ext) last.text += ch;
    else out.push({ text: ch, ext });
  }
  return out;
}

export async function certificatePdf(data: CertificateData): Promise<Buffer> {
  const qr = await QRCode.toBuffer(data.verifyUrl, { errorCorrectionLevel: 'M', margin: 1, width: 300 });
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', layout: 'landscape', margin: 48, info: { Title: `Driftproof credential ${data.number}`, Author: 'Driftproof' } });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    for (const [weight, files] of Object.entries(FACES)) {
      doc.registerFont(`Lato-${weight}`, path.join(fontDir, files.latin));
      doc.registerFont(`Lato-${weight}-ext`, path.join(fontDir, files.ext));
    }
    /** Writes text in Lato, switching to the latin-ext subset where a character needs it. */
    const write = (text: string, weight: 'regular' | 'bold', size: number, options: PDFKit.Mixins.TextOptions = {}) => {
      const parts = runs(text);
      parts.forEach((part, i) => {
        doc.font(`Lato-${weight}${part.ext ? '-ext' : ''}`).fontSize(size).text(part.text, { ...options, continued: i < parts.length - 1 });
      });
    };
    const width = doc.page.width;
    doc.rect(24, 24, width - 48, doc.page.height - 48).lineWidth(2).stroke('#0d5c63');
    doc.fillColor('#0d5c63');
    write('Driftproof', 'bold', 26);
    doc.fillColor('#1c2b33');
    write('Credential of drive assessment under odometry drift', 'regular', 13);
    doc.moveDown(1.2);
    write('This certifies that', 'regular', 12);
    doc.moveDown(0.2);
    write(data.holderName, 'bold', 28);
    if (data.organizationName) write(`of ${data.organizationName}`, 'regular', 13);
    doc.moveDown(0.6);
    write(`has passed the level “${data.levelName}” in exam drives:`, 'regular', 13);
    doc.moveDown(0.3);
    for (const t of data.trials) write(`•  ${t.title} — passed ${t.passedAt.slice(0, 10)}`, 'regular', 11);
    doc.moveDown(0.8);
    write(`Credential number: ${data.number}`, 'bold', 13);
    write(`Issued ${day(data.issuedAt)} · valid until ${day(data.expiresAt)}`, 'regular', 12);
    write(`Signature code (Ed25519): ${data.signatureCode}`, 'regular', 10);
    write(`Check it at ${data.verifyUrl.split('?')[0]} or scan the code.`, 'regular', 10);
    doc.image(qr, width - 48 - 150, 60, { width: 150 });
    doc.fillColor('#4d5d63');
    doc.x = 48;
    doc.y = doc.page.height - 84;
    write(SAFETY_CAUTION, 'regular', 8, { width: width - 96 });
    doc.end();
  });
}
