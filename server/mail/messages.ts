import type { OutgoingMail } from './mailer';
import { escapeHtml } from '../http/html';


function layout(heading: string, paragraphs: string[], link: { href: string; label: string }, footnote: string): string {
  return `<!doctype html><html><body style="font-family:'Source Sans 3',Arial,sans-serif;color:#1b2230;max-width:560px;margin:24px auto;line-height:1.5">
<h1 style="font-size:20px">${escapeHtml(heading)}</h1>
${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('\n')}
<p><a href="${escapeHtml(link.href)}" style="display:inline-block;background:#0f7c86;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p>
<p style="font-size:13px;color:#5a6473">${escapeHtml(footnote)}</p>
<p style="font-size:13px;color:#5a6473">If the button does not work, open this address: ${escapeHtml(link.href)}</p>
</body></html>`;
}

export function invitationMail(input: { to: string; teamName: string; inviter: string; role: string; link: string; expiresAt: Date }): OutgoingMail {
  const days = Math.round((input.expiresAt.getTime() - Date.now()) / 86_400_000);
  const lines = [`${input.inviter} invited you to join the team "${input.teamName}" on Tuckline as ${input.role}.`, 'Tuckline finds the kick hits in a song, tucks the bass under each one, and exports the automation for your DAW.'];
  const foot = `The link works once and expires in ${days} days. If you did not expect this, ignore this message.`;
  return {
    to: input.to,
    subject: `Join ${input.teamName} on Tuckline`,
    text: `${lines.join('\n\n')}\n\nAccept the invitation: ${input.link}\n\n${foot}\n`,
    html: layout(`Join ${input.teamName} on Tuckline`, lines, { href: input.link, label: 'Accept the invitation' }, foot),
  };
}

export function passwordResetMail(input: { to: string; link: string; minutes: number }): OutgoingMail {
  const lines = ['Someone asked to reset the password of your Tuckline account. If it was you, choose a new password with the link below.'];
  const foot = `The link works once and expires in ${input.minutes} minutes. If you did not ask for this, ignore this message: your password stays as it is.`;
  return {
    to: input.to,
    subject: 'Reset your Tuckline password',
    text: `${lines.join('\n\n')}\n\nChoose a new password: ${input.link}\n\n${foot}\n`,
    html: layout('Reset your Tuckline password', lines, { href: input.link, label: 'Choose a new password' }, foot),
  };
}
