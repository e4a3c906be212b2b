/** The receipt of a paid seat order: a PDF (pdfkit, Lato shipped with the app) e-mailed to the buyer. */
import { createRequire } from 'node:module';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import type { AppContext } from '../context';
import { Organization, SeatOrder, User } from '../db/models';
import { escapeHtml } from './mailer';

const require = createRequire(import.meta.url);
const fontDir = path.join(path.dirname(require.resolve('@fontsource/lato/package.json')), 'files');
// fontkit reads .woff (not .woff2); the files are unicode-range subsets, so latin and latin-ext are both registered.
export const LATO = {
  regular: path.join(fontDir, 'lato-latin-400-normal.woff'),
  bold: path.join(fontDir, 'lato-latin-700-normal.woff'),
};

const money = (cents: number, currency: string) => `${(cents / 100).toFixed(2)} ${currency.toUpperCase()}`;

export function receiptPdf(order: SeatOrder, organization: Organization, buyer: User | null): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', margin: 56, info: { Title: `Driftproof receipt ${order.id}`, Author: 'Driftproof' } });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.registerFont('Lato', LATO.regular);
    doc.registerFont('Lato-Bold', LATO.bold);
    doc.font('Lato-Bold').fontSize(22).fillColor('#0d5c63').text('Driftproof');
    doc.moveDown(0.3).font('Lato').fontSize(11).fillColor('#1c2b33').text('Receipt for exam seats');
    doc.moveDown(1.2);
    const line = (label: string, value: string) => doc.font('Lato-Bold').text(`${label}: `, { continued: true }).font('Lato').text(value);
    line('Receipt number', order.id);
    line('Paid on', (order.paidAt ?? new Date()).toISOString().slice(0, 10));
    line('Organization', organization.name);
    if (organization.address) line('Address', organization.address);
    if (buyer) line('Bought by', `${buyer.name} <${buyer.email}>`);
    doc.moveDown(1);
    line('Item', 'Driftproof exam seat (one exam drive each)');
    line('Quantity', String(order.quantity));
    line('Price per seat', money(order.unitAmount, order.currency));
    doc.moveDown(0.5).font('Lato-Bold').fontSize(14).text(`Total paid: ${money(order.amountTotal, order.currency)}`);
    doc.moveDown(2).font('Lato').fontSize(9).fillColor('#4d5d63')
      .text('Seats are credited to the organization and used one per exam drive. Unused seats can be refunded on request. A simulated assessment does not authorise anyone to operate a real robot.');
    doc.end();
  });
}

/** The job: e-mails the receipt of a paid order to its buyer (and the billing address when set). */
export async function sendReceipt(ctx: AppContext, orderId: string): Promise<void> {
  const order = await SeatOrder.findByPk(orderId);
  if (!order || !order.paidAt) return;
  const organization = (await Organization.findByPk(order.organizationId))!;
  const buyer = order.createdBy ? await User.findByPk(order.createdBy) : null;
  const to = [buyer?.email, organization.billingEmail].filter((e): e is string => !!e).join(', ');
  if (!to) return;
  const pdf = await receiptPdf(order, organization, buyer);
  const text = `Thank you. ${organization.name} bought ${order.quantity} exam seat${order.quantity === 1 ? '' : 's'} for ${money(order.amountTotal, order.currency)}. The receipt is attached.`;
  await ctx.mailer.send({
    to,
    subject: `Driftproof receipt: ${order.quantity} exam seat${order.quantity === 1 ? '' : 's'}`,
    text,
    html: `<p style="font-family:Lato,Arial,sans-serif">${escapeHtml(text)}</p>`,
    attachments: [{ filename: `driftproof-receipt-${order.id.slice(0, 8)}.pdf`, content: pdf, contentType: 'application/pdf' }],
  });
}
