import { Router } from 'express';
import type { FakeSmtp } from './fake-smtp';
import { escapeHtml } from '../http/html';


/**
 * `/dev/mail`: the messages the local SMTP fake caught, for development only
 * (mounted when no real SMTP server is configured). Plain HTML, no script.
 */
export function devInboxRoutes(fake: FakeSmtp): Router {
  const router = Router();
  router.get('/', (_req, res) => {
    const rows = fake
      .messages()
      .reverse()
      .map((m) => `<tr><td>${escapeHtml(m.receivedAt.replace('T', ' ').slice(0, 19))}</td><td>${escapeHtml(m.to.join(', '))}</td><td><a href="/dev/mail/${m.id}">${escapeHtml(m.subject)}</a></td></tr>`)
      .join('');
    res.type('html').send(`<!doctype html><meta charset="utf-8"><title>Tuckline · local mail</title>
<body style="font-family:sans-serif;max-width:900px;margin:24px auto"><h1>Local mail</h1>
<p>Messages sent while no real SMTP server is configured (SMTP_URL unset). They are kept in memory until the server stops.</p>
<table border="1" cellpadding="6" style="border-collapse:collapse;width:100%"><tr><th>Received</th><th>To</th><th>Subject</th></tr>${rows || '<tr><td colspan="3">No messages yet.</td></tr>'}</table></body>`);
  });
  router.get('/:id', (req, res) => {
    const message = fake.messages().find((m) => String(m.id) === req.params['id']);
    if (!message) {
      res.status(404).type('text').send('No such message.');
      return;
    }
    // The text part, shown as text: links stay clickable by hand, nothing from the message runs here.
    const linked = escapeHtml(message.text).replace(/(https?:\/\/[^\s<]+)/g, '<a href="$1">$1</a>');
    res.type('html').send(`<!doctype html><meta charset="utf-8"><title>${escapeHtml(message.subject)}</title>
<body style="font-family:sans-serif;max-width:760px;margin:24px auto"><p><a href="/dev/mail">← all messages</a></p>
<h1>${escapeHtml(message.subject)}</h1><p>To: ${escapeHtml(message.to.join(', '))} · From: ${escapeHtml(message.from)}</p><pre style="white-space:pre-wrap;font-family:inherit">${linked}</pre></body>`);
  });
  return router;
}
