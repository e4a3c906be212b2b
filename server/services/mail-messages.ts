/** What the local mail sink captured, for the admin's mail page and for tests. */
import { Op, type WhereOptions } from 'sequelize';
import type { CapturedMail, CapturedMailSummary, MailListQuery, Page } from '../../shared/schemas';
import { MailMessage } from '../db/models';
import { containsPattern } from '../db/like';
import { notFound } from '../http/errors';


export async function listMailMessages(query: MailListQuery): Promise<Page<CapturedMailSummary>> {
  const where: WhereOptions<MailMessage> = query.q
    ? { [Op.or]: [{ subject: { [Op.iLike]: containsPattern(query.q) } }, { toHeader: { [Op.iLike]: containsPattern(query.q) } }, { fromHeader: { [Op.iLike]: containsPattern(query.q) } }] }
    : {};
  const { rows, count } = await MailMessage.findAndCountAll({
    where,
    attributes: ['id', 'fromHeader', 'toHeader', 'subject', 'receivedAt'],
    order: [['receivedAt', query.sortOrder.toUpperCase()], ['id', query.sortOrder.toUpperCase()]],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { items: rows.map((m) => m.toSummary()), total: count, page: query.page, pageSize: query.pageSize };
}

export async function getMailMessage(id: number): Promise<CapturedMail> {
  const message = await MailMessage.findByPk(id);
  if (!message) throw notFound('That message');
  return message.toPublic();
}
