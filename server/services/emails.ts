/** The wording of the e-mails Driftproof sends, as text and HTML. */
import type { OutgoingMail } from './mailer';
import { escapeHtml } from './mailer';

function layout(paragraphs: string[], link: { href: string; label: string }, footer: string): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 14px">${escapeHtml(p)}</p>`).join('');
  return `<!doctype html><html><body style="font-family:Lato,Arial,sans-serif;color:#1c2b33;line-height:1.5">
<div style="max-width:560px;margin:0 auto;padding:24px">
<p style="font-weight:700;font-size:18px;color:#0d5c63;margin:0 0 18px">Driftproof</p>${body}
<p style="margin:22px 0"><a href="${escapeHtml(link.href)}" style="background:#0d5c63;color:#fff;padding:10px 18px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p>
<p style="font-size:13px;color:#5b6b73">${escapeHtml(footer)}</p></div></body></html>`;
}

export function passwordResetEmail(to: string, name: string, link: string, minutes: number): OutgoingMail {
  const lines = [`Hello ${name},`, 'Someone asked to reset the password of your Driftproof account. Use the link below to choose a new one.'];
  const footer = `The link works once and expires in ${minutes} minutes. If you did not ask for this, ignore this e-mail: your password stays as it is.`;
  return {
    to,
    subject: 'Reset your Driftproof password',
    text: `${lines.join('\n\n')}\n\n${link}\n\n${footer}\n`,
    html: layout(lines, { href: link, label: 'Choose a new password' }, footer),
  };
}

export function invitationEmail(to: string, name: string, link: string, hours: number): OutgoingMail {
  const lines = [`Hello ${name},`, 'An administrator has created a Driftproof account for you. Choose your password to sign in.'];
  const footer = `The link works once and expires in ${hours} hours. Ask your administrator for a new one if it has expired.`;
  return {
    to,
    subject: 'Your Driftproof account is ready',
    text: `${lines.join('\n\n')}\n\n${link}\n\n${footer}\n`,
    html: layout(lines, { href: link, label: 'Choose your password' }, footer),
  };
}

export function resultEmail(to: string, name: string, trialTitle: string, outcome: 'passed' | 'not passed' | 'voided', total: number | null, link: string): OutgoingMail {
  const lines = [
    `Hello ${name},`,
    outcome === 'voided'
      ? `Your exam drive of "${trialTitle}" was voided after review because of a technical fault. Your exam seat has been returned.`
      : `The result of your drive of "${trialTitle}" is final: ${outcome}, with ${total?.toFixed(1)} points.`,
    'The report shows the path you believed against the true path, the drift cloud at each call and how each call was graded.',
  ];
  const footer = 'A simulated assessment does not authorise anyone to operate a real robot: site training, your employer\'s written authorisation and local rules always apply.';
  return {
    to,
    subject: `Your Driftproof result: ${trialTitle}`,
    text: `${lines.join('\n\n')}\n\n${link}\n\n${footer}\n`,
    html: layout(lines, { href: link, label: 'Open the report' }, footer),
  };
}

export function emailConfirmationEmail(to: string, name: string, organization: string, link: string, hours: number): OutgoingMail {
  const lines = [`Hello ${name},`, `Confirm this address to finish setting up ${organization} on Driftproof. Until then you cannot buy exam seats.`];
  const footer = `The link works once and expires in ${hours} hours. If you did not sign up, ignore this e-mail.`;
  return {
    to,
    subject: 'Confirm your e-mail for Driftproof',
    text: `${lines.join('\n\n')}\n\n${link}\n\n${footer}\n`,
    html: layout(lines, { href: link, label: 'Confirm my e-mail' }, footer),
  };
}

export function operatorInvitationEmail(to: string, name: string, organization: string, link: string, hours: number): OutgoingMail {
  const lines = [`Hello ${name},`, `${organization} has enrolled you on Driftproof, where you practise and take drive assessments for wheeled robots. Choose your password to join.`];
  const footer = `The link works once and expires in ${hours} hours. Ask your employer to send a new one if it has expired.`;
  return {
    to,
    subject: `${organization} invites you to Driftproof`,
    text: `${lines.join('\n\n')}\n\n${link}\n\n${footer}\n`,
    html: layout(lines, { href: link, label: 'Join and choose a password' }, footer),
  };
}
